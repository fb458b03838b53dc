/**
 * Derived channels (docs/derived-channels.md) evaluated in a capture worker: the formula is read
 * against the decode's channels, only the channels it names are decoded (whole, from their
 * identifiers' chunks in the stored capture), and the answer — a decimated series, a span's
 * statistics, histogram and XY pairs, or a CSV export streamed like work/export.ts — goes back to
 * the server thread, which only passes keys. Evaluated formulas are kept in a byte-bounded cache of
 * this worker, so zooming and panning do not evaluate again.
 */
import type { MessagePort } from 'node:worker_threads';
import { MAX_XY_POINTS } from '../../../api/workbench';
import { channelSamples } from '../../../can/capture/chunked-decode';
import { decimateMinMax } from '../../../can/capture/decimate';
import { longFormCsv, wideFormCsv, type ExportChannel } from '../../../can/capture/export';
import { evaluateExpr, type DerivedSeries } from '../../../can/derived/evaluate';
import { parseFormula } from '../../../can/derived/formula';
import { histogram, spanStatistics, xyPairs } from '../../../can/derived/span';
import type { BlobStorage } from '../../storage/storage';
import { byteCache, openChunkSource } from '../capture-store';
import { refusedForRows, streamToPort } from './export';
import { compiledFor } from './series';
import type { DerivedExportTask, DerivedOutcome, DerivedTask, FormulaRefusal } from './tasks';

const MiB = 1024 * 1024;
type Evaluated = DerivedSeries & { inputs: number[] };
const evaluated = byteCache<Evaluated>(64 * MiB, (s) => 16 * s.time.length + 64);

/** A formula that does not read, as the 400 the server answers (the column counts from 1, as editors do). */
class FormulaError extends Error {
	constructor(readonly refusal: FormulaRefusal) {
		super(refusal.message);
	}
}

interface OnDecode {
	storage: DerivedTask['storage'];
	indexKey: string;
	map: DerivedTask['map'];
	folder: string;
}

/** The formula over the decode's channels, decoding only the channels it names. */
function evaluate(storage: BlobStorage, task: OnDecode, formula: string): Promise<Evaluated> {
	const key = `${JSON.stringify(task.storage)}|${task.folder}|${formula}`;
	return evaluated.get(key, async () => {
		const compiled = await compiledFor(task.folder, task.map);
		const parsed = parseFormula(formula, compiled.channels);
		if (!parsed.ok) {
			const { message, position } = parsed.problem;
			throw new FormulaError({
				message: `The formula does not read at character ${position + 1}: ${message}`,
				issues: [{ path: 'formula', message, column: position + 1 }]
			});
		}
		const source = await openChunkSource(storage, task.indexKey, { cache: false });
		const samples = new Map<number, { time: Float64Array; value: Float64Array }>();
		for (const index of parsed.inputs)
			samples.set(index, await channelSamples(source, compiled, index));
		return {
			...evaluateExpr(parsed.expr, parsed.inputs, (i) => samples.get(i)!),
			inputs: parsed.inputs
		};
	});
}

export async function runDerived(storage: BlobStorage, task: DerivedTask): Promise<DerivedOutcome> {
	try {
		const q = task.query;
		const series = await evaluate(storage, task, q.formula);
		if (q.what === 'series') {
			const d = decimateMinMax(series.time, series.value, q.from, q.to, q.points);
			return {
				ok: true,
				series: {
					inputs: series.inputs,
					time: Array.from(d.time),
					value: Array.from(d.value),
					decimated: !d.raw,
					samplesInRange: d.inRange,
					count: series.time.length
				}
			};
		}
		const versus = q.versus ? await evaluate(storage, task, q.versus) : null;
		return {
			ok: true,
			span: {
				from: q.from,
				to: q.to,
				statistics: spanStatistics(series, q.from, q.to, q.above),
				histogram: histogram(series, q.from, q.to, q.bins),
				xy: versus ? xyPairs(series, versus, q.from, q.to, MAX_XY_POINTS) : null
			}
		};
	} catch (error) {
		if (error instanceof FormulaError) return { ok: false, refusal: error.refusal };
		throw error;
	}
}

async function* fromSync(chunks: Iterable<string>): AsyncGenerator<string> {
	yield* chunks;
}

/**
 * The decode's channels followed by the derived ones as one long- or wide-form CSV, streamed to the
 * server with credits. The derived channels are evaluated first, so a formula that does not read is
 * refused before anything is decoded; every decoded channel is then held in this worker for the
 * export (the plain exports stream segment by segment instead).
 */
export function runDerivedExport(
	storage: BlobStorage,
	task: Omit<DerivedExportTask, 'port'> & { port: MessagePort }
): Promise<void> {
	return streamToPort(task.port, async () => {
		const compiled = await compiledFor(task.folder, task.map);
		const infos = compiled.channels;
		const derived: ExportChannel[] = [];
		for (const [k, d] of task.derived.entries()) {
			let series: Evaluated;
			try {
				series = await evaluate(storage, task, d.formula);
			} catch (error) {
				if (error instanceof FormulaError) return { refused: error.refusal };
				throw error;
			}
			derived.push({
				info: {
					index: infos.length + k,
					frameIndex: -1,
					frameName: 'Derived',
					signalName: d.name,
					unit: d.unit,
					min: null,
					max: null,
					precision: { kind: 'computed' }
				},
				time: series.time,
				value: series.value
			});
		}
		const source = await openChunkSource(storage, task.indexKey, { cache: false });
		const decoded: ExportChannel[] = [];
		for (const info of infos)
			decoded.push({ info, ...(await channelSamples(source, compiled, info.index)) });
		const channels = [...decoded, ...derived];
		const chunks =
			task.exportKind === 'long'
				? longFormCsv(channels)
				: wideFormCsv(channels, { interval: task.interval, mode: task.mode });
		// The first chunk now, so a refusal (far too many wide rows) comes before the download starts.
		const primed: IteratorResult<string>[] = [];
		const refused = refusedForRows(() => primed.push(chunks.next()));
		if (refused) return refused;
		const first = primed[0];
		return {
			chunks: fromSync(
				(function* () {
					if (!first.done) yield first.value;
					yield* { [Symbol.iterator]: () => chunks };
				})()
			)
		};
	});
}
