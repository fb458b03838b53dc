/**
 * Decoding a processed capture with one map revision (or the draft), recorded so a decoded view is
 * reproducible: the record names the revision, or the draft version it saw. Decoding works on the
 * stored compact frames (never the CSV again) and its results are kept in a small per-process LRU
 * cache keyed by capture + map + revision/draft version, so views of one decode do not re-decode.
 */
import type { FrameStore } from '../../can/capture/frame-store';
import { decodeCapture, type CaptureDecoding } from '../../can/capture/decode-capture';
import { compileMap, type CompiledMap } from '../../can/decoder';
import type { CanMap } from '../../can/map';
import { appendAudit } from '../workspaces/audit';
import { requireMap } from '../maps/maps';
import { requireRevision } from '../maps/revisions';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';
import { findDecode, insertDecode, requireCaptureRow } from './captures-db';
import { summarizeDecoding } from './decode-summary';
import { loadFrameStore } from './store';
import type { DecodeInput, DecodeResponse, DecodeSummary } from '../../api/capture-views';
import type { DecodeRecord } from '../../api/captures';

export interface Decoded {
	decode: DecodeRecord;
	map: CanMap;
	compiled: CompiledMap;
	store: FrameStore;
	result: CaptureDecoding;
}

interface CacheEntry {
	map: CanMap;
	compiled: CompiledMap;
	store: FrameStore;
	result: CaptureDecoding;
	summary?: DecodeSummary;
}

/** Decodes kept per process: each holds its channels' samples, so only a few (a 1M-frame capture's are tens of MB). */
const DECODE_CACHE_SIZE = 4;

// Per database, so test databases (and their random ids) never share entries. Promises are cached
// so two requests for the same decode wait for one computation instead of running two.
const caches = new WeakMap<object, Map<string, Promise<CacheEntry>>>();

function cacheOf(services: Pick<Services, 'db'>): Map<string, Promise<CacheEntry>> {
	let cache = caches.get(services.db);
	if (!cache) caches.set(services.db, (cache = new Map()));
	return cache;
}

/** capture + map + `r<n>` or `d<draft version>`: the same key means the same map text, so the same result. */
function decodeCacheKey(
	captureId: string,
	mapId: string,
	revision: number | null,
	draftVersion: number | null
): string {
	return `${captureId}|${mapId}|${revision !== null ? `r${revision}` : `d${draftVersion}`}`;
}

async function cached(
	services: Services,
	key: string,
	compute: () => Promise<CacheEntry>
): Promise<CacheEntry> {
	const cache = cacheOf(services);
	let entry = cache.get(key);
	if (entry) {
		cache.delete(key); // re-insert: Map order is the recency order
	} else {
		entry = compute();
		entry.catch(() => cache.get(key) === entry && cache.delete(key));
		while (cache.size >= DECODE_CACHE_SIZE) cache.delete(cache.keys().next().value!);
	}
	cache.set(key, entry);
	return entry;
}

/** Forgets every cached decode of a capture (when it is deleted). */
export function forgetCaptureDecodes(services: Pick<Services, 'db'>, captureId: string): void {
	const cache = cacheOf(services);
	for (const key of [...cache.keys()]) if (key.startsWith(`${captureId}|`)) cache.delete(key);
}

/** The capture if it belongs to the workspace and is processed (409 with the reason otherwise). */
export async function requireReadyCapture(
	services: Services,
	workspaceId: string,
	captureId: string
): Promise<CaptureRow> {
	const capture = await requireCaptureRow(services.db, workspaceId, captureId);
	if (capture.status !== 'ready') {
		throw new Problem(
			409,
			capture.status === 'failed'
				? `This capture could not be processed (${capture.error ?? 'unknown error'}), so there is nothing to decode.`
				: `This capture is not processed yet (status: ${capture.status}); process it first, then decode.`
		);
	}
	return capture;
}

function computeEntry(
	services: Services,
	capture: CaptureRow,
	map: CanMap
): () => Promise<CacheEntry> {
	return async () => {
		const store = await loadFrameStore(services, capture);
		const compiled = compileMap(map);
		return { map, compiled, store, result: decodeCapture(store, compiled) };
	};
}

/** Decodes a capture with a map revision or the current draft, records it, and returns the result. */
export async function decodeWith(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: DecodeInput,
	actorId: string
): Promise<{ decode: DecodeRecord; result: CaptureDecoding; summary: DecodeSummary }> {
	const { db } = services;
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const mapRecord = await requireMap(db, workspaceId, input.mapId);
	const revision = input.revision === 'draft' ? null : input.revision;
	const draftVersion = input.revision === 'draft' ? mapRecord.version : null;
	const map =
		revision === null ? mapRecord.draft : (await requireRevision(db, mapRecord.id, revision)).map;
	const entry = await cached(
		services,
		decodeCacheKey(capture.id, mapRecord.id, revision, draftVersion),
		computeEntry(services, capture, map)
	);
	const decode = await db.transaction().execute(async (trx) => {
		const record = await insertDecode(trx, {
			captureId: capture.id,
			mapId: mapRecord.id,
			mapName: mapRecord.name,
			revision,
			draftVersion,
			actorId
		});
		await appendAudit(trx, {
			workspaceId,
			actorId,
			action: 'capture.decode',
			target: capture.id,
			details: { decode: record.id, map: mapRecord.id, revision: revision ?? 'draft', draftVersion }
		});
		return record;
	});
	return { decode, result: entry.result, summary: summaryOf(entry) };
}

/** `r3`, or `draft-v12` for the draft as it was at version 12: what an export names. */
export function revisionLabel(decode: Pick<DecodeRecord, 'revision' | 'draftVersion'>): string {
	return decode.revision !== null ? `r${decode.revision}` : `draft-v${decode.draftVersion}`;
}

function summaryOf(entry: CacheEntry): DecodeSummary {
	return (entry.summary ??= summarizeDecoding(entry.result));
}

/**
 * A recorded decode with everything its views need. Re-decodes from the stored frames when it is no
 * longer cached; a draft decode whose draft has changed since cannot be reproduced and says so (410).
 */
export async function getDecoded(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string
): Promise<Decoded> {
	const { decode, entry } = await decodedEntry(services, workspaceId, captureId, decodeId);
	return {
		decode,
		map: entry.map,
		compiled: entry.compiled,
		store: entry.store,
		result: entry.result
	};
}

/** `getDecoded` plus the JSON summary (computed once per cached decode). */
export async function getDecodeSummary(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string
): Promise<DecodeResponse> {
	const { decode, entry } = await decodedEntry(services, workspaceId, captureId, decodeId);
	return { decode, summary: summaryOf(entry) };
}

async function decodedEntry(
	services: Services,
	workspaceId: string,
	captureId: string,
	decodeId: string
): Promise<{ decode: DecodeRecord; entry: CacheEntry }> {
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
	const key = decodeCacheKey(capture.id, mapId, decode.revision, decode.draftVersion);
	const entry = await cached(services, key, async () => {
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
		return computeEntry(services, capture, map)();
	});
	return { decode, entry };
}

/**
 * A processed capture decoded with a published map revision, for a read that stores nothing (a
 * receiver profile checked on the capture, its device alerts replayed): the same per-process cache
 * as recorded decodes, but no decode record and no audit entry, since nothing changes.
 */
export async function decodeWithRevision(
	services: Services,
	workspaceId: string,
	captureId: string,
	mapId: string,
	revision: number
): Promise<{ capture: CaptureRow; map: CanMap; result: CaptureDecoding }> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	await requireMap(services.db, workspaceId, mapId);
	const map = (await requireRevision(services.db, mapId, revision)).map;
	const entry = await cached(
		services,
		decodeCacheKey(capture.id, mapId, revision, null),
		computeEntry(services, capture, map)
	);
	return { capture, map: entry.map, result: entry.result };
}
