/**
 * Decoding a processed capture with one map revision (or the draft), recorded so a decoded view is
 * reproducible: the record names the revision, or the draft version it saw. The first decode of a
 * capture with a given map text runs in a capture worker (work/decode.ts) and is stored in the
 * capture's folder — statistics and one min/max pyramid per channel — so every later view, also
 * after a restart, reads that instead of decoding again. Stored decodes are keyed by capture + map +
 * revision or draft version: the same key means the same map text, so the same result.
 */
import type { DecodeInput, DecodeResponse, DecodeSummary } from '../../api/capture-views';
import type { DecodeRecord } from '../../api/captures';
import { compileMap, type CompiledMap } from '../../can/decoder';
import type { CanMap } from '../../can/map';
import { appendAudit } from '../workspaces/audit';
import { requireMap } from '../maps/maps';
import { requireRevision } from '../maps/revisions';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';
import { StorageNotFoundError } from '../storage/storage';
import {
	busKey,
	byteCache,
	captureKeys,
	decodeFolder,
	forgetCaptureStore,
	isLegacyStoreKey,
	splitBusKey
} from './capture-store';
import { guessBitrateFromMap } from './bitrate';
import { findDecode, insertDecode, requireCaptureRow } from './captures-db';
import { forgetFieldProposals } from './field-proposal-cache';
import { captureWorkerCount, heavyTasksInFlight, runCaptureTask } from './pool';
import { readStoredDecode } from './stored-decode';
import { mergeDecodeParts, summaryKey } from './work/decode';
import type { DecodePartOutcome, SamplesTask, StoredDecode } from './work/tasks';

const MiB = 1024 * 1024;
/** Stored decodes read back, by storage folder; sized by their JSON. */
const storedDecodes = byteCache<{ stored: StoredDecode; bytes: number }>(32 * MiB, (e) => e.bytes);
/** Compiled maps of recent decodes (compiling a large map takes a few milliseconds). */
const compiledMaps = byteCache<CompiledMap>(8 * MiB, (c) => 10_000 + 500 * c.channels.length);
/** Legacy stores being converted, by capture id, so two requests wait for one conversion. */
const converting = new Map<string, Promise<string>>();

/** The capture if it belongs to the workspace and is processed (409 with the reason otherwise). */
export async function requireReadyCapture(
	services: Services,
	workspaceId: string,
	captureId: string
): Promise<CaptureRow> {
	const capture = await requireCaptureRow(services.db, workspaceId, captureId);
	if (capture.status !== 'ready' || capture.store_key === null) {
		throw new Problem(
			409,
			capture.status === 'failed'
				? `This capture could not be processed (${capture.error ?? 'unknown error'}), so there is nothing to decode.`
				: `This capture is not processed yet (status: ${capture.status}); process it first, then decode.`
		);
	}
	return capture;
}

/**
 * The capture's chunk index key. A capture processed by an earlier version (one FrameStore blob)
 * is converted to the chunked store the first time it is opened, in a worker.
 */
export async function captureIndexKey(
	services: Pick<Services, 'db' | 'storage'>,
	capture: Pick<CaptureRow, 'id' | 'workspace_id' | 'store_key'>
): Promise<string> {
	const key = capture.store_key!;
	if (!isLegacyStoreKey(key)) return key;
	let pending = converting.get(capture.id);
	if (!pending) {
		pending = (async () => {
			const keys = captureKeys(capture.workspace_id, capture.id);
			const indexKey = await runCaptureTask<string>({
				kind: 'convert',
				storage: services.storage.settings,
				legacyKey: key,
				storeFolder: keys.storeFolder
			});
			await services.db
				.updateTable('captures')
				.set({ store_key: indexKey })
				.where('id', '=', capture.id)
				.where('store_key', '=', key)
				.execute();
			await services.storage.delete(key);
			return indexKey;
		})().finally(() => converting.delete(capture.id));
		converting.set(capture.id, pending);
	}
	return pending;
}

/** Captures from this many frames on are decoded in parts, one per worker (smaller ones in one pass). */
export const SPLIT_DECODE_FROM_FRAMES = 1 << 21;

/**
 * The first decode in the worker pool: in one pass, or for a large capture in as many parts as the
 * pool has workers (work/decode.ts), whose small figures are then joined here. Only an idle pool
 * splits: when other heavy work runs (other decodes, exports, processing) every thread is busy
 * anyway, and parts side by side with it would only add their working memory to theirs.
 */
async function firstDecode(
	services: Services,
	indexKey: string,
	folder: string,
	map: CanMap,
	frameCount: number
): Promise<StoredDecode> {
	const on = { storage: services.storage.settings, indexKey, map, folder };
	// A one-bus decode reads a filtered store (no chunk table to share out): one pass.
	const wholeStore = splitBusKey(indexKey).bus === null;
	const parts =
		wholeStore && frameCount >= SPLIT_DECODE_FROM_FRAMES && heavyTasksInFlight() === 0
			? captureWorkerCount()
			: 1;
	if (parts <= 1) return runCaptureTask<StoredDecode>({ kind: 'decode', ...on });
	const outcomes = await Promise.all(
		Array.from({ length: parts }, (_, part) =>
			runCaptureTask<DecodePartOutcome | null>({ kind: 'decode-part', ...on, part, parts })
		)
	);
	return mergeDecodeParts(services.storage, folder, outcomes);
}

/** Reads a stored decode, or decodes in workers (once, however many ask at the same time). */
function storedDecode(
	services: Services,
	indexKey: string,
	folder: string,
	map: CanMap,
	frameCount: number
): Promise<StoredDecode> {
	const id = JSON.stringify(services.storage.settings);
	return storedDecodes
		.get(`${id}|${folder}`, async () => {
			try {
				const bytes = await services.storage.getBytes(summaryKey(folder));
				return {
					stored: readStoredDecode(new TextDecoder().decode(bytes)),
					bytes: 2 * bytes.byteLength
				};
			} catch (error) {
				if (!(error instanceof StorageNotFoundError)) throw error;
			}
			const stored = await firstDecode(services, indexKey, folder, map, frameCount);
			return { stored, bytes: 2 * JSON.stringify(stored).length };
		})
		.then((e) => e.stored);
}

/**
 * Forgets what this thread keeps of a capture: its stored decodes and store (when it is deleted, or
 * as after a restart; the workers' own caches are theirs, see closeCaptureWorkers).
 */
export function forgetCaptureDecodes(captureId: string): void {
	storedDecodes.forget(`/${captureId}/`);
	compiledMaps.forget(`/${captureId}/`);
	forgetCaptureStore(captureId);
	forgetFieldProposals(captureId);
}

/** A bus to decode alone: one of the capture's buses (a capture of one bus has nothing to choose). */
function checkedBus(capture: CaptureRow, bus: number | null): number | null {
	if (bus === null) return null;
	const buses = capture.report_json
		? ((JSON.parse(capture.report_json) as { buses?: string[] }).buses ?? [])
		: [];
	if (buses.length < 2)
		throw new Problem(
			400,
			'This capture was recorded on one bus; decode it without choosing a bus.'
		);
	if (bus >= buses.length)
		throw new Problem(
			400,
			`This capture has ${buses.length} buses (0–${buses.length - 1}: ${buses.join(', ')}); there is no bus ${bus}.`
		);
	return bus;
}

/** Decodes a capture with a map revision or the current draft, records it, and returns the summary. */
export async function decodeWith(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: DecodeInput,
	actorId: string
): Promise<{ decode: DecodeRecord; summary: DecodeSummary }> {
	const { db } = services;
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const mapRecord = await requireMap(db, workspaceId, input.mapId);
	const revision = input.revision === 'draft' ? null : input.revision;
	const draftVersion = input.revision === 'draft' ? mapRecord.version : null;
	const map =
		revision === null ? mapRecord.draft : (await requireRevision(db, mapRecord.id, revision)).map;
	const bus = checkedBus(capture, input.bus ?? null);
	const storeKey = await captureIndexKey(services, capture);
	const indexKey = busKey(storeKey, bus);
	const folder = decodeFolder(storeKey, mapRecord.id, revision, draftVersion, bus);
	const stored = await storedDecode(services, indexKey, folder, map, capture.frame_count ?? 0);
	const decode = await db.transaction().execute(async (trx) => {
		const record = await insertDecode(trx, {
			captureId: capture.id,
			mapId: mapRecord.id,
			mapName: mapRecord.name,
			revision,
			draftVersion,
			actorId,
			bus
		});
		// The capture's bit rate, when nothing set it yet, is its first decode's map's.
		await guessBitrateFromMap(trx, capture.id, { name: mapRecord.name, bitrate: map.bitrate });
		await appendAudit(trx, {
			workspaceId,
			actorId,
			action: 'capture.decode',
			target: capture.id,
			details: {
				decode: record.id,
				map: mapRecord.id,
				revision: revision ?? 'draft',
				draftVersion,
				...(bus === null ? {} : { bus })
			}
		});
		return record;
	});
	return { decode, summary: stored.summary };
}

/** `r3`, or `draft-v12` for the draft as it was at version 12: what an export names. */
export function revisionLabel(decode: Pick<DecodeRecord, 'revision' | 'draftVersion'>): string {
	return decode.revision !== null ? `r${decode.revision}` : `draft-v${decode.draftVersion}`;
}

/** A recorded decode with what its views need: the map it used, where its data is, its figures. */
export interface OpenDecode {
	decode: DecodeRecord;
	capture: CaptureRow;
	map: CanMap;
	indexKey: string;
	folder: string;
	stored: StoredDecode;
}

/**
 * A recorded decode, its stored figures read back (or decoded again when missing). A draft decode
 * whose draft has changed since cannot be reproduced and says so (410), as does one whose map was deleted.
 */
export async function openDecode(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string
): Promise<OpenDecode> {
	const { db } = services;
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const decode = await findDecode(db, capture.id, decodeId);
	if (!decode) throw new Problem(404, 'Decode not found for this capture.');
	if (decode.mapId === null) {
		throw new Problem(
			410,
			`The map "${decode.mapName}" this decode used has been deleted; decode the capture with another map.`
		);
	}
	const mapId = decode.mapId;
	let map: CanMap;
	if (decode.revision !== null) map = (await requireRevision(db, mapId, decode.revision)).map;
	else {
		const current = await requireMap(db, workspaceId, mapId);
		if (current.version !== decode.draftVersion) {
			throw new Problem(
				410,
				`This decode used version ${decode.draftVersion} of the draft of "${decode.mapName}", which has changed since (now version ${current.version}); decode again with the draft or a published revision.`
			);
		}
		map = current.draft;
	}
	const storeKey = await captureIndexKey(services, capture);
	const indexKey = busKey(storeKey, decode.bus);
	const folder = decodeFolder(storeKey, mapId, decode.revision, decode.draftVersion, decode.bus);
	return {
		decode,
		capture,
		map,
		indexKey,
		folder,
		stored: await storedDecode(services, indexKey, folder, map, capture.frame_count ?? 0)
	};
}

/** The compiled map of an open decode (kept for the next request). */
export function compiledOf(open: Pick<OpenDecode, 'folder' | 'map'>): Promise<CompiledMap> {
	return compiledMaps.get(open.folder, async () => compileMap(open.map));
}

/** The JSON summary of a recorded decode. */
export async function getDecodeSummary(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string
): Promise<DecodeResponse> {
	const { decode, stored } = await openDecode(services, workspaceId, captureId, decodeId);
	return { decode, summary: stored.summary };
}

/** Every sample of one channel of a decode, decoded in a worker (tests and small captures: memory grows with the channel). */
export async function decodedChannelSamples(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string,
	channel: number
): Promise<{ time: Float64Array; value: Float64Array }> {
	const open = await openDecode(services, workspaceId, captureId, decodeId);
	return runCaptureTask({
		kind: 'samples',
		storage: services.storage.settings,
		indexKey: open.indexKey,
		map: open.map,
		folder: open.folder,
		channel
	} satisfies SamplesTask);
}

/**
 * A processed capture decoded with a published map revision, for a read that records nothing (a
 * receiver profile checked on the capture, its device alerts replayed): the decode's figures are
 * stored and shared like a recorded decode's, but no decode record and no audit entry are made.
 */
export async function openRevisionDecode(
	services: Services,
	workspaceId: string,
	captureId: string,
	mapId: string,
	revision: number
): Promise<Omit<OpenDecode, 'decode'>> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	await requireMap(services.db, workspaceId, mapId);
	const map = (await requireRevision(services.db, mapId, revision)).map;
	const indexKey = await captureIndexKey(services, capture);
	const folder = decodeFolder(indexKey, mapId, revision, null);
	return {
		capture,
		map,
		indexKey,
		folder,
		stored: await storedDecode(services, indexKey, folder, map, capture.frame_count ?? 0)
	};
}
