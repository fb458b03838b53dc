/**
 * A capture as a streamed CSV download: its raw frames in the canonical layout, or the channels of
 * a decode in long or wide form. Decoded exports name the map revision in the file name and in
 * `X-Framewright-Revision`.
 */
import type { z } from 'zod';
import type { exportQuerySchema } from '../../api/capture-views';
import {
	canonicalCaptureCsv,
	captureExportFileName,
	csvByteStream,
	longFormCsv,
	wideFormCsv
} from '../../can/capture/export';
import { Problem } from '../problem';
import type { Services } from '../services';
import { getDecoded, requireReadyCapture, revisionLabel } from './decoding';
import { loadFrameStore } from './store';

/** The capture's own name without its file extension, for the download's name. */
export const baseName = (name: string) => name.replace(/\.[A-Za-z0-9]{1,5}$/, '');

/**
 * Pulls the first chunk before the response starts, so a refusal (a wide export with far too many
 * rows) becomes a 400 instead of a download that breaks off.
 */
export function primed(chunks: Generator<string>): Iterable<string> {
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

export async function exportCapture(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: z.output<typeof exportQuerySchema>
): Promise<Response> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
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
		// exportQuerySchema requires a decode for the decoded kinds.
		const { decode, result } = await getDecoded(services, workspaceId, capture.id, q.decode!);
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
}
