/**
 * The server side of an export produced in a capture worker (work/export.ts): a web stream that asks
 * the worker for the next chunk only when the download has taken the last ones, so a slow client
 * holds a few chunks in memory, and the server thread only passes bytes on.
 */
import { MessageChannel, type MessagePort } from 'node:worker_threads';
import type { Issue } from '../../api/problem';
import type { FromExportWorker, ToExportWorker } from './work/export';

/** Chunks the worker may send ahead of the download. */
const CREDITS_AHEAD = 4;

/** Thrown before the stream starts when the worker refuses the export (e.g. too many wide rows). */
export class ExportRefused extends Error {
	override name = 'ExportRefused';
	constructor(
		message: string,
		/** What the person should change (e.g. the interval, a formula at a column). */
		readonly issues?: Issue[]
	) {
		super(message);
	}
}

/**
 * Starts an export with `start(port)` (which runs the worker task) and resolves when the worker is
 * ready to stream, or rejects (ExportRefused, or the failure) before any byte is sent.
 */
export async function streamFromWorker(
	start: (port: MessagePort) => Promise<unknown>
): Promise<ReadableStream<Uint8Array>> {
	const { port1, port2 } = new MessageChannel();
	const send = (m: ToExportWorker) => port1.postMessage(m);
	const queue: Uint8Array[] = [];
	let ended = false;
	let failure: Error | null = null;
	let notify: (() => void) | null = null;
	let readyState: ((outcome: Error | null) => void) | null = null;
	const ready = new Promise<Error | null>((resolve) => (readyState = resolve));
	const settle = (outcome: Error | null) => {
		readyState?.(outcome);
		readyState = null;
	};
	port1.on('message', (m: FromExportWorker) => {
		if (m.type === 'ready') settle(null);
		else if (m.type === 'refused') settle(new ExportRefused(m.message, m.issues));
		else if (m.type === 'chunk') queue.push(m.bytes);
		else if (m.type === 'end') ended = true;
		else {
			failure = new Error(m.message);
			settle(failure);
		}
		notify?.();
	});
	start(port2).then(
		// The port's own messages (ready, chunks, end) may arrive after the task's answer: the
		// stream ends with 'end', never with the task. A task that said nothing at all failed.
		() => setTimeout(() => settle(new Error('the export ended before it started')), 1000).unref(),
		(error: unknown) => {
			failure = error instanceof Error ? error : new Error(String(error));
			settle(failure);
			notify?.();
		}
	);
	const outcome = await ready;
	if (outcome) {
		port1.close();
		throw outcome;
	}
	send({ type: 'credit', n: CREDITS_AHEAD });
	return new ReadableStream<Uint8Array>(
		{
			async pull(controller) {
				while (queue.length === 0 && !ended && !failure)
					await new Promise<void>((resolve) => (notify = resolve));
				notify = null;
				const next = queue.shift();
				if (next) {
					controller.enqueue(next);
					send({ type: 'credit', n: 1 });
				} else if (failure) {
					port1.close();
					controller.error(failure);
				} else {
					port1.close();
					controller.close();
				}
			},
			cancel() {
				send({ type: 'cancel' });
				port1.close();
			}
		},
		{ highWaterMark: 0 }
	);
}
