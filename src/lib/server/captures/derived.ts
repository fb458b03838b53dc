/**
 * Derived channels of a decode (docs/derived-channels.md): a formula evaluated over the decode's
 * channels, served decimated like a decoded channel, or exported beside the decoded channels.
 * The evaluation itself is the pure `src/lib/can/derived/` module.
 */
import type { z } from 'zod';
import {
	MAX_XY_POINTS,
	type DerivedSeriesQuery,
	type DerivedSeriesResponse,
	type derivedExportQuerySchema,
	type SpanQuery,
	type SpanResponse
} from '../../api/workbench';
import { histogram, spanStatistics, xyPairs } from '../../can/derived/span';
import { decimateMinMax } from '../../can/capture/decimate';
import {
	captureExportFileName,
	csvByteStream,
	longFormCsv,
	wideFormCsv,
	type ExportChannel
} from '../../can/capture/export';
import { evaluateExpr, type DerivedSeries } from '../../can/derived/evaluate';
import { parseFormula } from '../../can/derived/formula';
import { Problem } from '../problem';
import type { Services } from '../services';
import {
	compiledOf,
	decodedChannelSamples,
	openDecode,
	revisionLabel,
	type OpenDecode
} from './decoding';
import { baseName, primed } from './export';

/** Evaluated formulas kept per process, so zooming and panning do not evaluate again. */
const CACHE_SIZE = 8;
const caches = new WeakMap<object, Map<string, DerivedSeries>>();

/**
 * The formula over the decode's channels; a formula that does not read is a 400 naming the
 * position. Only the channels it names are decoded (each in a capture worker, from its frames'
 * chunks); the evaluation over them runs here.
 */
async function evaluate(
	services: Services,
	open: OpenDecode,
	formula: string
): Promise<DerivedSeries & { inputs: number[] }> {
	let cache = caches.get(services.db);
	if (!cache) caches.set(services.db, (cache = new Map()));
	const key = `${open.decode.id}|${formula}`;
	const hit = cache.get(key);
	if (hit) return hit as DerivedSeries & { inputs: number[] };
	const { channels } = await compiledOf(open);
	const parsed = parseFormula(formula, channels);
	if (!parsed.ok) {
		const { message, position } = parsed.problem;
		// The column counts from 1, as editors do.
		throw new Problem(400, `The formula does not read at character ${position + 1}: ${message}`, [
			{ path: 'formula', message, column: position + 1 }
		]);
	}
	const samples = new Map<number, { time: Float64Array; value: Float64Array }>();
	for (const index of parsed.inputs)
		samples.set(index, await channelSamplesOf(services, open, index));
	const series = {
		...evaluateExpr(parsed.expr, parsed.inputs, (i) => samples.get(i)!),
		inputs: parsed.inputs
	};
	while (cache.size >= CACHE_SIZE) cache.delete(cache.keys().next().value!);
	cache.set(key, series);
	return series;
}

/** One decoded channel's every sample, decoded in a capture worker. */
function channelSamplesOf(
	services: Services,
	open: OpenDecode,
	channel: number
): Promise<{ time: Float64Array; value: Float64Array }> {
	return decodedChannelSamples(
		services,
		open.capture.workspace_id,
		open.capture.id,
		open.decode.id,
		channel
	);
}

export async function derivedSeries(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: DerivedSeriesQuery
): Promise<DerivedSeriesResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const series = await evaluate(services, open, q.formula);
	const duration = open.stored.summary.durationS;
	const from = q.from ?? Math.min(0, q.to ?? 0);
	const to = q.to ?? Math.max(duration, from);
	const d = decimateMinMax(series.time, series.value, from, to, q.points);
	return {
		inputs: series.inputs ?? [],
		time: Array.from(d.time),
		value: Array.from(d.value),
		decimated: !d.raw,
		samplesInRange: d.inRange,
		count: series.time.length
	};
}

/** Statistics, histogram and (with `versus`) XY pairs of a channel over a span. */
export async function measureSpan(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: SpanQuery
): Promise<SpanResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const series = await evaluate(services, open, q.formula);
	const from = q.from ?? 0;
	const to = q.to ?? Math.max(open.stored.summary.durationS, from);
	const versus = q.versus ? await evaluate(services, open, q.versus) : null;
	return {
		from,
		to,
		statistics: spanStatistics(series, from, to, q.above),
		histogram: histogram(series, from, to, q.bins),
		xy: versus ? xyPairs(series, versus, from, to, MAX_XY_POINTS) : null
	};
}

/** The decode's channels followed by the derived ones, as one long- or wide-form CSV download. */
export async function exportDerived(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: z.output<typeof derivedExportQuerySchema>
): Promise<Response> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const { capture, decode } = open;
	const { channels: infos } = await compiledOf(open);
	// The derived channels first, so a formula that does not read is refused before any decoding.
	const derived: ExportChannel[] = [];
	for (const [k, d] of q.derived.entries()) {
		const series = await evaluate(services, open, d.formula);
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
	// Every decoded channel's samples are held for this export: memory grows with the capture
	// (the plain exports stream segment by segment instead).
	const decoded: ExportChannel[] = [];
	for (const info of infos)
		decoded.push({ info, ...(await channelSamplesOf(services, open, info.index)) });
	const channels = [...decoded, ...derived];
	const chunks = primed(
		q.kind === 'long'
			? longFormCsv(channels)
			: wideFormCsv(channels, { interval: q.interval, mode: q.mode })
	);
	const revision = revisionLabel(decode);
	const fileName = captureExportFileName(baseName(capture.name), q.kind, {
		mapName: decode.mapName,
		revision
	}).replace(/\.csv$/, '.derived.csv');
	return new Response(csvByteStream(chunks), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'cache-control': 'no-store',
			'content-disposition': `attachment; filename="${fileName}"`,
			'x-framewright-revision': revision
		}
	});
}
