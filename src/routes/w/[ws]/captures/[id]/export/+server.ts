import {
	canonicalCaptureCsv,
	captureExportFileName,
	csvByteStream,
	longFormCsv,
	wideFormCsv
} from '$lib/can/capture/export';
import { getDecoded, requireReadyCapture, revisionLabel } from '$lib/server/captures/decoding';
import { loadFrameStore } from '$lib/server/captures/store';
import { exportQuerySchema, queryObject } from '$lib/server/captures/view-schemas';
import { requireRole } from '$lib/server/guard';
import { orPageError } from '$lib/server/map-views';
import { parseOrProblem, Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/** The capture's own name without its file extension, for the download's name. */
const baseName = (name: string) => name.replace(/\.[A-Za-z0-9]{1,5}$/, '');

/**
 * Pulls the first chunk before the response starts, so a refusal (a wide export with far too many
 * rows) becomes a 400 instead of a download that breaks off.
 */
function primed(chunks: Generator<string>): Iterable<string> {
	let first: IteratorResult<string>;
	try {
		first = chunks.next();
	} catch (thrown) {
		if (thrown instanceof RangeError)
			throw new Problem(400, thrown.message, [{ path: 'interval', message: thrown.message }]);
		throw thrown;
	}
	return (function* () {
		if (!first.done) yield first.value;
		yield* { [Symbol.iterator]: () => chunks };
	})();
}

/**
 * `?kind=long|wide|frames&decode=<decodeId>&interval=<s>&mode=last|mean` → a streamed CSV download.
 * Decoded exports name the map revision in the file name and in `X-Framewright-Revision`.
 */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const q = parseOrProblem(exportQuerySchema, queryObject(event.url));
		const { services } = event.locals;
		const capture = await requireReadyCapture(services, workspace.id, event.params.id);
		const headers = new Headers({
			'content-type': 'text/csv; charset=utf-8',
			'cache-control': 'no-store'
		});
		let chunks: Iterable<string>;
		let fileName: string;
		if (q.kind === 'frames') {
			chunks = primed(canonicalCaptureCsv(await loadFrameStore(services, capture)));
			fileName = captureExportFileName(baseName(capture.name), 'frames');
		} else {
			const { decode, result } = await getDecoded(services, workspace.id, capture.id, q.decode!);
			const revision = revisionLabel(decode);
			chunks = primed(
				q.kind === 'long'
					? longFormCsv(result.channels)
					: wideFormCsv(result.channels, { interval: q.interval, mode: q.mode })
			);
			fileName = captureExportFileName(baseName(capture.name), q.kind, {
				mapName: decode.mapName,
				revision
			});
			headers.set('x-framewright-revision', revision);
		}
		headers.set('content-disposition', `attachment; filename="${fileName}"`);
		return new Response(csvByteStream(chunks), { headers });
	});
};
