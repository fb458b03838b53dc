/**
 * Worker thread entry: parses one capture CSV, streamed in by the main thread chunk by chunk, into
 * the compact FrameStore, so a large import never blocks the server's event loop. Each chunk is
 * acknowledged once the parser took it (the main thread's flow control and progress). Bundled with
 * esbuild: at build time into the build folder, on demand in development and tests
 * (see worker-bundle.ts).
 */
import { parentPort, threadId, workerData } from 'node:worker_threads';
import { CaptureFormatError } from '../../can/capture/detect-layout';
import { ingestCapture } from '../../can/capture/ingest';
import type { CaptureLayout } from '../../can/capture/layout';
import type { ToWorker, FromWorker } from './worker-protocol';

const port = parentPort!;
const queue: Uint8Array[] = [];
let ended = false;
let wake: (() => void) | null = null;

port.on('message', (message: ToWorker) => {
	if (message.type === 'chunk') queue.push(message.bytes);
	else ended = true;
	wake?.();
});

const send = (message: FromWorker, transfer: ArrayBuffer[] = []) =>
	port.postMessage(message, transfer);

async function* chunks(): AsyncGenerator<Uint8Array> {
	for (;;) {
		while (queue.length > 0) {
			const chunk = queue.shift()!;
			yield chunk;
			send({ type: 'consumed', bytes: chunk.byteLength });
		}
		if (ended) return;
		await new Promise<void>((resolve) => (wake = resolve));
		wake = null;
	}
}

try {
	const { store, ...report } = await ingestCapture(chunks(), {
		layout: (workerData as { layout: CaptureLayout }).layout
	});
	let durationS = 0;
	for (const t of store.time) if (t > durationS) durationS = t;
	const bytes = store.toBytes();
	send({ type: 'done', report, durationS, store: bytes, threadId }, [bytes.buffer as ArrayBuffer]);
} catch (error) {
	send({
		type: 'failed',
		message: error instanceof Error ? error.message : String(error),
		formatError: error instanceof CaptureFormatError,
		threadId
	});
}
port.close();
