/**
 * A capture export produced in a capture worker and streamed to the server thread through a
 * MessagePort with credits: the worker sends a chunk only when the server asked for one, so a slow
 * download holds a few chunks in memory and nothing blocks the server's event loop.
 *
 * Worker → server: ready | refused (e.g. too many wide rows, a formula that does not read: the
 * server answers 400 with the message and its issues)
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
import type { ExportTask, FormulaRefusal } from './tasks';

export type FromExportWorker =
	| { type: 'ready' }
	| { type: 'refused'; message: string; issues?: FormulaRefusal['issues'] }
	| { type: 'chunk'; bytes: Uint8Array }
	| { type: 'end' }
	| { type: 'failed'; message: string };
export type ToExportWorker = { type: 'credit'; n: number } | { type: 'cancel' };

/**
 * Streams the chunks `open` gives through `port` with credits (see the file comment); `open` may
 * refuse instead (a message for the person: the server answers 400 before any byte is sent).
 */
export async function streamToPort(
	port: MessagePort,
	open: () => Promise<{ chunks: AsyncGenerator<string> } | { refused: FormulaRefusal }>
): Promise<void> {
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
			const opened = await open();
			if ('refused' in opened) {
				send({ type: 'refused', ...opened.refused });
				return;
			}
			chunks = opened.chunks;
		} catch (error) {
			send({ type: 'failed', message: error instanceof Error ? error.message : String(error) });
			return;
		}
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

/**
 * Runs `start` (which throws a RangeError for far too many wide rows) and answers the refusal
 * naming the interval, or null when it went through; other errors are thrown on.
 */
export function refusedForRows(start: () => unknown): { refused: FormulaRefusal } | null {
	try {
		start();
		return null;
	} catch (error) {
		if (!(error instanceof RangeError)) throw error;
		return {
			refused: { message: error.message, issues: [{ path: 'interval', message: error.message }] }
		};
	}
}

export function runExport(
	storage: BlobStorage,
	task: Omit<ExportTask, 'port'> & { port: MessagePort }
): Promise<void> {
	return streamToPort(task.port, async () => {
		const source = await openChunkSource(storage, task.indexKey, { cache: false });
		if (task.exportKind === 'frames') return { chunks: framesCsvChunked(source) };
		// Decoded exports of a capture with a clock: relative seconds stay, its reading is added
		// (docs/capture-csv.md). The frames export stays the canonical layout, to import again.
		const origin = task.origin && hasClock(task.origin) ? task.origin : null;
		const clocked = (chunks: AsyncGenerator<string>) =>
			origin ? withClockColumn(chunks, origin) : chunks;
		const compiled = compileMap(task.map!);
		if (task.exportKind === 'long')
			return { chunks: clocked(longFormCsvChunked(source, compiled)) };
		const options = { interval: task.interval, mode: task.mode, channelTimes: task.channelTimes };
		const refused = refusedForRows(() => wideRows(options)); // before anything is sent
		return refused ?? { chunks: clocked(wideFormCsvChunked(source, compiled, options)) };
	});
}
