/**
 * Derived channels of a decode (docs/derived-channels.md): a formula evaluated over the decode's
 * channels, served decimated like a decoded channel, measured over a span, or exported beside the
 * decoded channels. The evaluation runs in a capture worker (work/derived.ts), which decodes only
 * the channels the formula names from the stored capture; this thread passes keys and returns the
 * worker's answer. The evaluation itself is the pure `src/lib/can/derived/` module.
 */
import type { z } from 'zod';
import type {
	DerivedSeriesQuery,
	DerivedSeriesResponse,
	derivedExportQuerySchema,
	SpanQuery,
	SpanResponse
} from '../../api/workbench';
import { captureExportFileName } from '../../can/capture/export';
import { Problem } from '../problem';
import type { Services } from '../services';
import { openDecode, revisionLabel, type OpenDecode } from './decoding';
import { baseName, exportFromWorker } from './export';
import { runCaptureTask } from './pool';
import type { DerivedOutcome, DerivedTask } from './work/tasks';

/**
 * Asks a worker; a formula that does not read is a 400 naming the position. A derived series is a
 * plot, answered in the interactive pool beside the series windows; a span's statistics, histogram
 * and XY pairs go to the heavy pool, so measuring (which may decode whole channels of a long
 * capture) never holds up a plot's window on the interactive thread.
 */
async function askWorker(
	services: Services,
	open: OpenDecode,
	query: DerivedTask['query']
): Promise<Exclude<DerivedOutcome, { ok: false }>> {
	const outcome = await runCaptureTask<DerivedOutcome>(
		{
			kind: 'derived',
			storage: services.storage.settings,
			indexKey: open.indexKey,
			map: open.map,
			folder: open.folder,
			query
		},
		{ interactive: query.what === 'series' }
	);
	if (!outcome.ok) throw new Problem(400, outcome.refusal.message, outcome.refusal.issues);
	return outcome;
}

export async function derivedSeries(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: DerivedSeriesQuery
): Promise<DerivedSeriesResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const duration = open.stored.summary.durationS;
	const from = q.from ?? Math.min(0, q.to ?? 0);
	const to = q.to ?? Math.max(duration, from);
	const outcome = await askWorker(services, open, {
		what: 'series',
		formula: q.formula,
		from,
		to,
		points: q.points
	});
	if (!('series' in outcome)) throw new Error('the worker answered a span for a series');
	return outcome.series;
}

/** Statistics, histogram and (with `versus`) XY pairs of a channel over a span. */
export async function measureSpan(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: SpanQuery
): Promise<SpanResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const from = q.from ?? 0;
	const to = q.to ?? Math.max(open.stored.summary.durationS, from);
	const outcome = await askWorker(services, open, {
		what: 'span',
		formula: q.formula,
		versus: q.versus ?? null,
		from,
		to,
		above: q.above,
		bins: q.bins
	});
	if (!('span' in outcome)) throw new Error('the worker answered a series for a span');
	return outcome.span;
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
	const body = await exportFromWorker({
		kind: 'derived-export',
		storage: services.storage.settings,
		indexKey: open.indexKey,
		map: open.map,
		folder: open.folder,
		exportKind: q.kind,
		derived: q.derived,
		interval: q.interval,
		mode: q.mode
	});
	const revision = revisionLabel(decode);
	const fileName = captureExportFileName(baseName(capture.name), q.kind, {
		mapName: decode.mapName,
		revision
	}).replace(/\.csv$/, '.derived.csv');
	return new Response(body, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'cache-control': 'no-store',
			'content-disposition': `attachment; filename="${fileName}"`,
			'x-framewright-revision': revision
		}
	});
}
