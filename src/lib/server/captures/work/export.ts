/**
 * A capture export produced in a capture worker and streamed to the server thread through a
 * MessagePort with credits: the worker sends a chunk only when the server asked for one, so a slow
 * download holds a few chunks in memory and nothing blocks the server's event loop.
 *
 * Worker → server: ready | refused (a RangeError, e.g. too many wide rows: the server answers 400)
 * | chunk (UTF-8 bytes, transferred) | end | failed.   Server → worker: credit { n } | cancel.
 */
import type { MessagePort } from 'node:worker_threads';
import {
	framesCsvChunked,
	longFormCsvChunked,
	wideFormCsvChunked,
	wideRows
} from '../../../can/capture/chunked-export';
import { hasClock, withClockColumn } from '../../../can/capture/clock';
import { compileMap } from '../../../can/decoder';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import type { ExportTask } from './tasks';

export type FromExportWorker =
	| { type: 'ready' }
	| { type: 'refused'; message: string }
	| { type: 'chunk'; bytes: Uint8Array }
	| { type: 'end' }
	| { type: 'failed'; message: string };
export type ToExportWorker = { type: 'credit'; n: number } | { type: 'cancel' };

export async function runExport(
	storage: BlobStorage,
	task: Omit<ExportTask, 'port'> & { port: MessagePort }
): Promise<void> {
	const port = task.port;
	const send = (m: FromExportWorker, transfer: ArrayBuffer[] = []) => port.postMessage(m, transfer);
	let credits = 0;
	let cancelled = false;
	let wake: (() => void) | null = null;
	port.on('message', (m: ToExportWorker) => {
		if (m.type === 'credit') credits += m.n;
		else cancelled = true;
		wake?.();
	});
	try {
		let chunks: AsyncGenerator<string>;
		try {
			const source = await openChunkSource(storage, task.indexKey, { cache: false });
			if (task.exportKind === 'frames') chunks = framesCsvChunked(source);
			else {
				const compiled = compileMap(task.map!);
				if (task.exportKind === 'long') chunks = longFormCsvChunked(source, compiled);
				else {
					const options = {
						interval: task.interval,
						mode: task.mode,
						channelTimes: task.channelTimes
					};
					wideRows(options); // refuses too many rows before anything is sent
					chunks = wideFormCsvChunked(source, compiled, options);
				}
			}
		} catch (error) {
			if (error instanceof RangeError) send({ type: 'refused', message: error.message });
			else
				send({ type: 'failed', message: error instanceof Error ? error.message : String(error) });
			return;
		}
		// Decoded exports of a capture with a clock: relative seconds stay, its reading is added
		// (docs/capture-csv.md). The frames export stays the canonical layout, to import again.
		if (task.exportKind !== 'frames' && task.origin && hasClock(task.origin))
			chunks = withClockColumn(chunks, task.origin);
		send({ type: 'ready' });
		const encoder = new TextEncoder();
		try {
			for await (const text of chunks) {
				while (credits === 0 && !cancelled) await new Promise<void>((r) => (wake = r));
				wake = null;
				if (cancelled) {
					await chunks.return(undefined);
					return;
				}
				credits--;
				const bytes = encoder.encode(text);
				send({ type: 'chunk', bytes }, [bytes.buffer as ArrayBuffer]);
			}
			send({ type: 'end' });
		} catch (error) {
			send({ type: 'failed', message: error instanceof Error ? error.message : String(error) });
		}
	} finally {
		port.close();
	}
}
