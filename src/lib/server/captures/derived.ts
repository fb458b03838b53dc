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
import type { Channel } from '../../can/capture/channels';
import { decimateMinMax } from '../../can/capture/decimate';
import {
	captureExportFileName,
	csvByteStream,
	longFormCsv,
	wideFormCsv,
	type ExportChannel
} from '../../can/capture/export';
import { evaluateFormula, type DerivedSeries } from '../../can/derived/evaluate';
import { Problem } from '../problem';
import type { Services } from '../services';
import { getDecoded, requireReadyCapture, revisionLabel } from './decoding';
import { baseName, primed } from './export';

/** Evaluated formulas kept per process, so zooming and panning do not evaluate again. */
const CACHE_SIZE = 8;
const caches = new WeakMap<object, Map<string, DerivedSeries>>();

/** The formula over the decode's channels; a formula that does not read is a 400 naming the position. */
function evaluate(
	services: Services,
	decodeId: string,
	channels: readonly Channel[],
	formula: string
): DerivedSeries & { inputs?: number[] } {
	let cache = caches.get(services.db);
	if (!cache) caches.set(services.db, (cache = new Map()));
	const key = `${decodeId}|${formula}`;
	const hit = cache.get(key);
	if (hit) return hit;
	const result = evaluateFormula(
		formula,
		channels.map((c) => ({ ...c.info, time: c.time, value: c.value }))
	);
	if (!result.ok) {
		const { message, position } = result.problem;
		// The column counts from 1, as editors do.
		throw new Problem(400, `The formula does not read at character ${position + 1}: ${message}`, [
			{ path: 'formula', message, column: position + 1 }
		]);
	}
	const series = { ...result.series, inputs: result.inputs };
	while (cache.size >= CACHE_SIZE) cache.delete(cache.keys().next().value!);
	cache.set(key, series);
	return series;
}

export async function derivedSeries(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: DerivedSeriesQuery
): Promise<DerivedSeriesResponse> {
	const { result } = await getDecoded(services, workspaceId, captureId, q.decode);
	const series = evaluate(services, q.decode, result.channels, q.formula);
	const from = q.from ?? Math.min(0, q.to ?? 0);
	const to = q.to ?? Math.max(result.duration, from);
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
	const { result } = await getDecoded(services, workspaceId, captureId, q.decode);
	const series = evaluate(services, q.decode, result.channels, q.formula);
	const from = q.from ?? 0;
	const to = q.to ?? Math.max(result.duration, from);
	const versus = q.versus ? evaluate(services, q.decode, result.channels, q.versus) : null;
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
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const { decode, result } = await getDecoded(services, workspaceId, capture.id, q.decode);
	const derived: ExportChannel[] = q.derived.map((d, k) => {
		const series = evaluate(services, q.decode, result.channels, d.formula);
		return {
			info: {
				index: result.channels.length + k,
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
		};
	});
	const channels = [...result.channels, ...derived];
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
