/**
 * A capture as a streamed CSV download: its raw frames in the canonical layout, or the channels of
 * a decode in long or wide form, produced in a capture worker from the chunked store and streamed
 * with back-pressure (export-stream.ts), so a download of any size blocks no other request. Decoded
 * exports name the map revision in the file name and in `X-Framewright-Revision`.
 */
import type { z } from 'zod';
import type { exportQuerySchema } from '../../api/capture-views';
import { captureReportSchema } from '../../api/captures';
import { captureExportFileName } from '../../can/capture/export';
import { Problem } from '../problem';
import type { Services } from '../services';
import { captureIndexKey, openDecode, requireReadyCapture, revisionLabel } from './decoding';
import { ExportRefused, streamFromWorker } from './export-stream';
import { runCaptureTask } from './pool';
import type { DerivedExportTask, ExportTask } from './work/tasks';

/** The capture's own name without its file extension, for the download's name. */
export const baseName = (name: string) => name.replace(/\.[A-Za-z0-9]{1,5}$/, '');

export async function exportCapture(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: z.output<typeof exportQuerySchema>
): Promise<Response> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const origin = capture.report_json
		? captureReportSchema.parse(JSON.parse(capture.report_json)).origin
		: undefined;
	const headers = new Headers({
		'content-type': 'text/csv; charset=utf-8',
		'cache-control': 'no-store'
	});
	let task: Omit<ExportTask, 'port' | 'storage'>;
	let fileName: string;
	if (q.kind === 'frames') {
		task = {
			kind: 'export',
			exportKind: 'frames',
			indexKey: await captureIndexKey(services, capture),
			map: null,
			interval: q.interval,
			mode: q.mode,
			channelTimes: []
		};
		fileName = captureExportFileName(baseName(capture.name), 'frames');
	} else {
		// exportQuerySchema requires a decode for the decoded kinds.
		const open = await openDecode(services, workspaceId, capture.id, q.decode!);
		const revision = revisionLabel(open.decode);
		task = {
			kind: 'export',
			exportKind: q.kind,
			indexKey: open.indexKey,
			map: open.map,
			interval: q.interval,
			mode: q.mode,
			channelTimes: open.stored.channels
		};
		fileName = captureExportFileName(baseName(capture.name), q.kind, {
			mapName: open.decode.mapName,
			revision
		});
		headers.set('x-framewright-revision', revision);
	}
	const body = await exportFromWorker({ ...task, origin, storage: services.storage.settings });
	headers.set('content-disposition', `attachment; filename="${fileName}"`);
	return new Response(body, { headers });
}

/**
 * Runs an export task (ExportTask, DerivedExportTask) in the heavy pool and returns its stream; a
 * refusal (a wide export with far too many rows, a formula that does not read) becomes a 400
 * before the download starts.
 */
export async function exportFromWorker(
	task: Omit<ExportTask, 'port'> | Omit<DerivedExportTask, 'port'>
): Promise<ReadableStream<Uint8Array>> {
	try {
		return await streamFromWorker((port) =>
			runCaptureTask({ ...task, port: port as never }, { transferList: [port] })
		);
	} catch (error) {
		if (error instanceof ExportRefused) throw new Problem(400, error.message, error.issues);
		throw error;
	}
}
