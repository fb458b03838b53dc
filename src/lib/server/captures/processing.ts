/**
 * Processing a capture: its stored CSV is parsed once, in a worker thread, into the compact
 * FrameStore, which is stored beside it; reopening the capture later reads only that store.
 * The route answers 202 at once and the work runs in the background, writing progress
 * (bytes parsed / size) to the row for polling; failures end in status 'failed' with a readable
 * error, never a half-stored result.
 */
import { Worker } from 'node:worker_threads';
import { ingestCapture } from '../../can/capture/ingest';
import type { CaptureLayout } from '../../can/capture/layout';
import { appendAudit } from '../workspaces/audit';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';
import { byteChunks } from '../storage/storage';
import {
	insertCapture,
	requireCaptureRow,
	requireCaptureSummary,
	updateCapture
} from './captures-db';
import type { CaptureReport, CaptureSummary } from '../../api/captures';
import { captureKeys, forgetFrameStore } from './store';
import { DETECTION_BYTES, detectFromHead } from './upload';
import { captureWorkerPath } from './worker-bundle';
import type { FromWorker, ToWorker } from './worker-protocol';

type ProcessingServices = Pick<Services, 'db' | 'storage'>;

/** Chunks sent to the worker and not yet parsed; bounds memory whatever the file size. */
const MAX_CHUNKS_IN_FLIGHT = 4;
/** Progress is written at most this often. */
const PROGRESS_INTERVAL_MS = 250;

export interface ParseOutcome {
	report: CaptureReport;
	frameCount: number;
	durationS: number;
	store: Uint8Array;
	/** The worker thread that parsed (for tests and logs). */
	threadId: number;
}

/** A capture's data rows could not be read as a whole (not a per-row problem). */
export class CaptureProcessingError extends Error {
	override name = 'CaptureProcessingError';
}

function reportOf(r: Omit<Awaited<ReturnType<typeof ingestCapture>>, 'store'>): CaptureReport {
	return {
		frameCount: r.frameCount,
		lineCount: r.lineCount,
		badRows: r.badRows,
		badRowCount: r.badRowCount,
		warnings: r.warnings,
		layoutNotes: r.layoutNotes
	};
}

/** Streams `source` to a new capture worker and resolves with its parse. */
export async function parseInWorker(
	source: AsyncIterable<Uint8Array>,
	layout: CaptureLayout,
	onProgress: (bytesParsed: number) => void = () => {}
): Promise<ParseOutcome> {
	const worker = new Worker(await captureWorkerPath(), { workerData: { layout } });
	let inFlight = 0;
	let parsed = 0;
	let resume: (() => void) | null = null;
	let failure: Error | null = null;
	const result = new Promise<ParseOutcome>((resolve, reject) => {
		worker.on('message', (message: FromWorker) => {
			if (message.type === 'consumed') {
				inFlight--;
				parsed += message.bytes;
				onProgress(parsed);
				resume?.();
			} else if (message.type === 'done') {
				resolve({
					report: reportOf(message.report),
					frameCount: message.report.frameCount,
					durationS: message.durationS,
					store: message.store,
					threadId: message.threadId
				});
			} else {
				reject(
					message.formatError
						? new CaptureProcessingError(message.message)
						: new Error(message.message)
				);
			}
		});
		worker.on('error', reject);
		worker.on('exit', (code) =>
			reject(new Error(`the capture worker stopped unexpectedly (exit code ${code})`))
		);
	});
	result.catch((error: Error) => {
		failure = error;
		resume?.();
	});
	try {
		for await (const chunk of source) {
			if (failure) break;
			// A copy the worker can own (transferred, not cloned); storage may reuse its buffers.
			const bytes = chunk.slice();
			worker.postMessage({ type: 'chunk', bytes } satisfies ToWorker, [bytes.buffer]);
			inFlight++;
			while (inFlight >= MAX_CHUNKS_IN_FLIGHT && !failure) {
				await new Promise<void>((r) => (resume = r));
				resume = null;
			}
		}
		if (!failure) worker.postMessage({ type: 'end' } satisfies ToWorker);
		return await result;
	} finally {
		await worker.terminate();
	}
}

async function* single(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

/** Work in progress, by capture id, so tests and shutdown can wait for it. */
const running = new Map<string, Promise<void>>();

export function processingDone(captureId: string): Promise<void> {
	return running.get(captureId) ?? Promise.resolve();
}

/** Settles when every processing running now has finished (for shutdown). */
export async function allProcessingDone(): Promise<void> {
	await Promise.allSettled([...running.values()]);
}

export const INTERRUPTED_MESSAGE =
	'Processing was interrupted when the server stopped; process the capture again.';

/**
 * At server start no worker of this process can be running, so a capture still marked
 * 'processing' was cut off by a restart: it is marked failed (and can be processed again).
 */
export async function failInterruptedProcessing(db: ProcessingServices['db']): Promise<number> {
	const result = await db
		.updateTable('captures')
		.set({ status: 'failed', progress: 0, error: INTERRUPTED_MESSAGE, store_key: null })
		.where('status', '=', 'processing')
		.executeTakeFirst();
	return Number(result.numUpdatedRows);
}

/** Marks the capture 'processing' with the confirmed layout and starts the worker; returns at once. */
export async function startProcessing(
	services: ProcessingServices,
	input: { workspaceId: string; captureId: string; layout: CaptureLayout; actorId: string }
): Promise<CaptureSummary> {
	const row = await requireCaptureRow(services.db, input.workspaceId, input.captureId);
	if (row.status === 'processing' || running.has(row.id))
		throw new Problem(409, 'This capture is being processed already.');
	if (row.status === 'ready') {
		throw new Problem(
			409,
			'This capture is processed already; reopening it never parses the file again. Upload the file again to use another layout.'
		);
	}
	// Conditional on the status read above, so two requests at once cannot both start a worker.
	const claimed = await services.db
		.updateTable('captures')
		.set({
			status: 'processing',
			progress: 0,
			error: null,
			layout_json: JSON.stringify(input.layout)
		})
		.where('id', '=', row.id)
		.where('status', '=', row.status)
		.executeTakeFirst();
	if (Number(claimed.numUpdatedRows) !== 1)
		throw new Problem(409, 'This capture is being processed already.');
	await appendAudit(services.db, {
		workspaceId: input.workspaceId,
		actorId: input.actorId,
		action: 'capture.process',
		target: row.id
	});
	const work = runProcessing(services, row, input.layout).finally(() => running.delete(row.id));
	running.set(row.id, work);
	return requireCaptureSummary(services.db, input.workspaceId, row.id);
}

/** Stores the frame store, then marks the row ready with its report (the row never points at a missing store). */
async function saveOutcome(
	services: ProcessingServices,
	captureId: string,
	storeKey: string,
	outcome: Omit<ParseOutcome, 'threadId'>
): Promise<void> {
	await services.storage.put(storeKey, single(outcome.store));
	forgetFrameStore(storeKey);
	await updateCapture(services.db, captureId, {
		status: 'ready',
		progress: 1,
		report_json: JSON.stringify(outcome.report),
		frame_count: outcome.frameCount,
		duration_s: outcome.durationS,
		store_key: storeKey,
		error: null,
		processed_at: new Date().toISOString()
	});
}

/**
 * Uploads and processes a capture in this thread, with its detected layout: for the demo seed,
 * where a few thousand frames are not worth a worker and no request is waiting.
 */
export async function importCaptureInProcess(
	services: ProcessingServices,
	input: { workspaceId: string; actorId: string | null; fileName: string; text: string }
): Promise<string> {
	const bytes = new TextEncoder().encode(input.text);
	const id = crypto.randomUUID();
	const keys = captureKeys(input.workspaceId, id);
	const detected = detectFromHead(
		bytes.subarray(0, DETECTION_BYTES),
		bytes.byteLength <= DETECTION_BYTES
	);
	await services.storage.put(keys.raw, single(bytes));
	await insertCapture(services.db, {
		id,
		workspaceId: input.workspaceId,
		fileName: input.fileName,
		sizeBytes: bytes.byteLength,
		actorId: input.actorId,
		rawKey: keys.raw,
		detected,
		layout: detected.layout
	});
	const { store, ...report } = await ingestCapture(input.text, { layout: detected.layout });
	let durationS = 0;
	for (const t of store.time) if (t > durationS) durationS = t;
	await saveOutcome(services, id, keys.store, {
		report: reportOf(report),
		frameCount: report.frameCount,
		durationS,
		store: store.toBytes()
	});
	return id;
}

/** Parses in the worker and stores the result; any failure is written to the row, never thrown. */
async function runProcessing(
	services: ProcessingServices,
	row: CaptureRow,
	layout: CaptureLayout
): Promise<void> {
	const storeKey = captureKeys(row.workspace_id, row.id).store;
	let lastWrite = 0;
	let writing: Promise<void> = Promise.resolve();
	const onProgress = (bytes: number) => {
		const now = Date.now();
		if (now - lastWrite < PROGRESS_INTERVAL_MS) return;
		lastWrite = now;
		// Never quite 1 before the result is stored.
		const progress = Math.min(0.99, row.size_bytes > 0 ? bytes / row.size_bytes : 0);
		writing = writing.then(() => updateCapture(services.db, row.id, { progress })).catch(() => {});
	};
	try {
		const source = byteChunks(await services.storage.get(row.raw_key));
		const outcome = await parseInWorker(source, layout, onProgress);
		await writing;
		await saveOutcome(services, row.id, storeKey, outcome);
	} catch (error) {
		await writing;
		await services.storage.delete(storeKey).catch(() => {});
		const message =
			error instanceof CaptureProcessingError
				? error.message
				: `Processing failed: ${error instanceof Error ? error.message : String(error)}. The uploaded file is kept; try again or upload it again.`;
		await updateCapture(services.db, row.id, {
			status: 'failed',
			progress: 0,
			error: message,
			store_key: null
		}).catch(() => {});
	}
}
