/**
 * Processing a capture: its stored CSV is parsed once, in a capture worker thread (pool.ts), into
 * the chunked frame store (chunk-store.ts) written segment by segment beside it; reopening the
 * capture later reads only that store. The route answers 202 at once and the work runs in the
 * background, writing progress (bytes parsed / size) to the row for polling; failures end in status
 * 'failed' with a readable error, never a half-stored result. A capture deleted while it was being
 * processed has its output discarded.
 *
 * A processed capture can be read again with another layout (docs/capture-csv.md, "Reading a file
 * again"): the new store goes to a folder of its own (`store-<n>/`) while the old one stays, and
 * replaces it — with the decodes made from it — only once it is complete. A failed re-read leaves
 * the capture ready with its earlier layout, store and decodes, and the reason in its error.
 */
import { MessageChannel } from 'node:worker_threads';
import type { CaptureLayout } from '../../can/capture/layout';
import { appendAudit } from '../workspaces/audit';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';
import type { BlobStorage } from '../storage/storage';
import {
	insertCapture,
	requireCaptureRow,
	requireCaptureSummary,
	updateCapture
} from './captures-db';
import type { CaptureSummary } from '../../api/captures';
import {
	captureKeys,
	decodesRootOf,
	forgetCaptureStore,
	isLegacyStoreKey,
	storeFolderFor,
	storeFolderOf,
	storeGeneration
} from './capture-store';
import { forgetCaptureDecodes } from './decoding';
import { runCaptureTask } from './pool';
import { DETECTION_BYTES, detectFromHead } from './upload';
import { runProcess } from './work/process';
import type { ProcessOutcome } from './work/tasks';

type ProcessingServices = Pick<Services, 'db' | 'storage'>;

/** Progress is written at most this often. */
const PROGRESS_INTERVAL_MS = 250;

/**
 * Parses a stored capture file in a worker thread into a chunked store under `storeFolder`;
 * `onProgress` gets the bytes read so far.
 */
export async function processInWorker(
	storage: BlobStorage,
	input: { rawKey: string; layout: CaptureLayout; storeFolder: string; segmentFrames?: number },
	onProgress: (bytesRead: number) => void = () => {},
	signal?: AbortSignal
): Promise<ProcessOutcome> {
	const { port1, port2 } = new MessageChannel();
	port1.on('message', (m: { bytes: number }) => onProgress(m.bytes));
	try {
		return await runCaptureTask<ProcessOutcome>(
			{ kind: 'process', storage: storage.settings, ...input, progress: port2 as never },
			{ transferList: [port2], signal }
		);
	} finally {
		port1.close();
	}
}

async function* single(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

/** Work in progress, by capture id, so tests and shutdown can wait for it and a deletion can stop it. */
const running = new Map<
	string,
	{ work: Promise<void>; workspaceId: string; abort: AbortController }
>();

export function processingDone(captureId: string): Promise<void> {
	return running.get(captureId)?.work ?? Promise.resolve();
}

/** Stops the processing of every capture of a workspace being deleted, and waits for it to end. */
export async function stopWorkspaceProcessing(workspaceId: string): Promise<void> {
	const stopping = [...running.values()].filter((r) => r.workspaceId === workspaceId);
	for (const r of stopping) r.abort.abort();
	await Promise.all(stopping.map((r) => r.work));
}

/** Every processing still running (for shutdown). */
export function allProcessingDone(): Promise<unknown> {
	return Promise.all([...running.values()].map((r) => r.work));
}

export const INTERRUPTED_MESSAGE =
	'Processing was interrupted when the server stopped; process the capture again.';
export const INTERRUPTED_REREAD_MESSAGE =
	'Reading the file again was interrupted when the server stopped; the earlier result is kept.';

/** The store folder the next processing of a capture writes (a new one for each re-read). */
function nextStoreFolder(row: Pick<CaptureRow, 'id' | 'workspace_id' | 'store_key'>): string {
	const folder = captureKeys(row.workspace_id, row.id).folder;
	return storeFolderFor(folder, row.store_key === null ? 1 : storeGeneration(row.store_key) + 1);
}

/**
 * At server start no worker of this process can be running, so a capture still marked
 * 'processing' was cut off by a restart: it is marked failed (and can be processed again), and the
 * segments it had written are removed when the storage is given.
 */
export async function failInterruptedProcessing(
	db: ProcessingServices['db'],
	storage?: BlobStorage
): Promise<number> {
	const cut = await db
		.selectFrom('captures')
		.select(['id', 'workspace_id', 'store_key'])
		.where('status', '=', 'processing')
		.execute();
	// A re-read (the capture has a store) goes back to its earlier result.
	await db
		.updateTable('captures')
		.set({ status: 'ready', progress: 1, error: INTERRUPTED_REREAD_MESSAGE })
		.where('status', '=', 'processing')
		.where('store_key', 'is not', null)
		.execute();
	await db
		.updateTable('captures')
		.set({ status: 'failed', progress: 0, error: INTERRUPTED_MESSAGE, store_key: null })
		.where('status', '=', 'processing')
		.execute();
	if (storage) for (const c of cut) await storage.deletePrefix(nextStoreFolder(c)).catch(() => 0);
	return cut.length;
}

/** Marks the capture 'processing' with the confirmed layout and starts the worker; returns at once. */
export async function startProcessing(
	services: ProcessingServices,
	input: { workspaceId: string; captureId: string; layout: CaptureLayout; actorId: string }
): Promise<CaptureSummary> {
	const row = await requireCaptureRow(services.db, input.workspaceId, input.captureId);
	if (row.status === 'processing' || running.has(row.id))
		throw new Problem(409, 'This capture is being processed already.');
	// A processed capture is read again: its layout changes only when the new store is complete.
	const reread = row.status === 'ready';
	// Conditional on the status read above, so two requests at once cannot both start a worker.
	const claimed = await services.db
		.updateTable('captures')
		.set({
			status: 'processing',
			progress: 0,
			error: null,
			...(reread ? {} : { layout_json: JSON.stringify(input.layout) })
		})
		.where('id', '=', row.id)
		.where('status', '=', row.status)
		.executeTakeFirst();
	if (Number(claimed.numUpdatedRows) !== 1)
		throw new Problem(409, 'This capture is being processed already.');
	await appendAudit(services.db, {
		workspaceId: input.workspaceId,
		actorId: input.actorId,
		action: reread ? 'capture.reprocess' : 'capture.process',
		target: row.id
	});
	const abort = new AbortController();
	const work = runProcessing(services, row, input.layout, abort.signal).finally(() =>
		running.delete(row.id)
	);
	running.set(row.id, { work, workspaceId: row.workspace_id, abort });
	return requireCaptureSummary(services.db, input.workspaceId, row.id);
}

/**
 * Marks the row ready with its report once its store is complete; when the row is gone or no longer
 * processing (deleted meanwhile), the store is removed instead and false returned.
 */
async function saveOutcome(
	services: ProcessingServices,
	row: Pick<CaptureRow, 'id' | 'workspace_id'>,
	layout: CaptureLayout,
	outcome: Extract<ProcessOutcome, { ok: true }>
): Promise<boolean> {
	const updated = await services.db
		.updateTable('captures')
		.set({
			status: 'ready',
			layout_json: JSON.stringify(layout),
			progress: 1,
			report_json: JSON.stringify(outcome.report),
			frame_count: outcome.frameCount,
			duration_s: outcome.durationS,
			store_key: outcome.indexKey,
			error: null,
			processed_at: new Date().toISOString()
		})
		.where('id', '=', row.id)
		.where('status', '=', 'processing')
		.executeTakeFirst();
	if (Number(updated.numUpdatedRows) === 1) return true;
	await discardOutput(services, row, storeFolderOf(outcome.indexKey));
	return false;
}

/** After a re-read succeeded: the earlier store and the decodes made from it go. */
async function dropEarlierStore(
	services: ProcessingServices,
	row: Pick<CaptureRow, 'id' | 'workspace_id'>,
	earlierKey: string
): Promise<void> {
	forgetCaptureDecodes(row.id);
	if (isLegacyStoreKey(earlierKey)) {
		await services.storage.delete(earlierKey);
		await services.storage.deletePrefix(captureKeys(row.workspace_id, row.id).decodes);
		return;
	}
	await services.storage.deletePrefix(storeFolderOf(earlierKey));
	await services.storage.deletePrefix(decodesRootOf(earlierKey));
}

/** What processing wrote for a capture that is gone (its whole folder if the row is gone too). */
async function discardOutput(
	services: ProcessingServices,
	row: Pick<CaptureRow, 'id' | 'workspace_id'>,
	storeFolder: string
): Promise<void> {
	const keys = captureKeys(row.workspace_id, row.id);
	const exists = await services.db
		.selectFrom('captures')
		.select('id')
		.where('id', '=', row.id)
		.executeTakeFirst();
	await services.storage.deletePrefix(exists ? storeFolder : keys.folder);
	forgetCaptureStore(row.id);
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
	const outcome = await runProcess(services.storage, {
		rawKey: keys.raw,
		layout: detected.layout,
		storeFolder: keys.storeFolder
	});
	if (!outcome.ok)
		throw new Error(`The demo capture ${input.fileName} does not parse: ${outcome.message}`);
	await saveOutcome(services, { id, workspace_id: input.workspaceId }, detected.layout, outcome);
	return id;
}

/** Parses in the worker and stores the result; any failure is written to the row, never thrown. */
async function runProcessing(
	services: ProcessingServices,
	row: CaptureRow,
	layout: CaptureLayout,
	signal: AbortSignal
): Promise<void> {
	const storeFolder = nextStoreFolder(row);
	const earlierKey = row.status === 'ready' ? row.store_key : null;
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
	let message: string;
	try {
		// What an earlier, failed attempt may have left.
		await services.storage.deletePrefix(storeFolder);
		const outcome = await processInWorker(
			services.storage,
			{ rawKey: row.raw_key, layout, storeFolder },
			onProgress,
			signal
		);
		await writing;
		if (outcome.ok && earlierKey && outcome.frameCount === 0) {
			// A re-read that reads no frame never replaces the earlier result.
			const first = outcome.report.badRows[0];
			message = `no row could be read as a frame with this layout${first ? ` (line ${first.line}: ${first.reason})` : ''}.`;
		} else if (outcome.ok) {
			if ((await saveOutcome(services, row, layout, outcome)) && earlierKey)
				await dropEarlierStore(services, row, earlierKey).catch(() => {});
			return;
		} else
			message = outcome.formatError
				? outcome.message
				: `Processing failed: ${outcome.message}. The uploaded file is kept; try again or upload it again.`;
	} catch (error) {
		await writing;
		message = `Processing failed: ${error instanceof Error ? error.message : String(error)}. The uploaded file is kept; try again or upload it again.`;
	}
	await discardOutput(services, row, storeFolder).catch(() => {});
	await services.db
		.updateTable('captures')
		.set(
			earlierKey
				? {
						status: 'ready',
						progress: 1,
						error: `Reading the file again failed, so the earlier result is kept: ${message}`
					}
				: { status: 'failed', progress: 0, error: message, store_key: null }
		)
		.where('id', '=', row.id)
		.where('status', '=', 'processing')
		.execute()
		.catch(() => {});
}
