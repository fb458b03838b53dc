/**
 * Where a capture's blobs live and how its chunked frame store is read back, in the server and in
 * the capture workers alike. Everything of a capture sits under one folder, so deleting the folder
 * deletes the capture's every object:
 *
 *   captures/<workspace>/<capture>/raw.csv                       the upload (raw.csv.gz when gzip, kept compressed)
 *   captures/<workspace>/<capture>/store/index.fwci              the chunk index (the row's store_key)
 *   captures/<workspace>/<capture>/store/segment-000000.fwcg     segments (chunk-store.ts)
 *   captures/<workspace>/<capture>/decodes/<map>.r<n>/…          a decode's statistics and pyramids
 *   captures/<workspace>/<capture>/store-<n>/, decodes-<n>/      the same after the n-th processing (re-read)
 *   captures/<workspace>/<capture>/frames.fwcs                   the single-blob store of earlier versions
 *
 * Reads go through caches bounded by bytes (lru-cache), one set per thread.
 */
import { LRUCache } from 'lru-cache';
import { ChunkIndex, Segment, type Chunk } from '../../can/capture/chunk-store';
import { busChunkSource } from '../../can/capture/bus-source';
import { chunkSource, type ChunkSource } from '../../can/capture/chunked-decode';
import { FrameStore } from '../../can/capture/frame-store';
import type { BlobStorage } from '../storage/storage';

/** Storage keys of a capture's blobs. */
export function captureKeys(workspaceId: string, captureId: string) {
	const folder = `captures/${workspaceId}/${captureId}/`;
	return {
		folder,
		raw: `${folder}raw.csv`,
		/** A gzip-compressed upload, stored as it came (docs/capture-csv.md, "Compressed files"). */
		rawGz: `${folder}raw.csv.gz`,
		storeFolder: `${folder}store/`,
		index: `${folder}store/index.fwci`,
		decodes: `${folder}decodes/`,
		/** The single-blob FrameStore that versions before the chunked store wrote. */
		legacyStore: `${folder}frames.fwcs`
	};
}

export const workspaceCaptureFolder = (workspaceId: string) => `captures/${workspaceId}/`;

/** A legacy single-blob store (converted to the chunked store on first use). */
export const isLegacyStoreKey = (key: string) => key.endsWith('.fwcs');

/** The folder of a store from its index key. */
export const storeFolderOf = (indexKey: string) => indexKey.slice(0, indexKey.lastIndexOf('/') + 1);

export const segmentKey = (storeFolder: string, s: number) =>
	`${storeFolder}segment-${String(s).padStart(6, '0')}.fwcg`;

/**
 * Which processing of the capture a store is: 1 for `store/` (and single-blob stores), n for the
 * `store-<n>/` a re-processing with another layout writes (docs/capture-csv.md, "Reading a file
 * again"). Every processing writes a folder never used before, so no cache in any thread can
 * mistake the new store or its decodes for the old ones.
 */
export function storeGeneration(indexKey: string): number {
	const m = /\/store-(\d+)\/[^/]*$/.exec(indexKey);
	return m ? Number(m[1]) : 1;
}

/** The store folder of a capture folder's n-th processing. */
export const storeFolderFor = (captureFolder: string, generation: number) =>
	generation <= 1 ? `${captureFolder}store/` : `${captureFolder}store-${generation}/`;

/** The folder of the decodes made from the store of a chunk index key. */
export function decodesRootOf(indexKey: string): string {
	const g = storeGeneration(indexKey);
	return `${captureFolderOfIndex(indexKey)}decodes${g > 1 ? `-${g}` : ''}/`;
}

/** The decode folder for (map, revision or draft version) of the store at `indexKey`. */
export function decodeFolder(
	indexKey: string,
	mapId: string,
	revision: number | null,
	draftVersion: number | null,
	bus: number | null = null
): string {
	const onBus = bus === null ? '' : `.bus${bus}`;
	return `${decodesRootOf(indexKey)}${mapId}.${revision !== null ? `r${revision}` : `d${draftVersion}`}${onBus}/`;
}

/**
 * The key a one-bus decode's tasks name the store by: the index key and the bus (tasks carry keys,
 * never frames, so the bus travels with the key; openChunkSource reads it back).
 */
export const busKey = (indexKey: string, bus: number | null) =>
	bus === null ? indexKey : `${indexKey}#bus=${bus}`;

export function splitBusKey(key: string): { indexKey: string; bus: number | null } {
	const at = key.lastIndexOf('#bus=');
	return at < 0
		? { indexKey: key, bus: null }
		: { indexKey: key.slice(0, at), bus: Number(key.slice(at + 5)) };
}

/** The capture folder of a store's index key (…/<capture>/store/index.fwci → …/<capture>/). */
export const captureFolderOfIndex = (indexKey: string) =>
	storeFolderOf(storeFolderOf(indexKey).slice(0, -1));

// ---------------------------------------------------------------- caches

/** Each store's name in cache keys: two test stores may hold the same key. */
function storeId(storage: BlobStorage): string {
	const s = storage.settings;
	return s.driver === 'local' ? `local:${s.root}` : `s3:${s.bucket}/${s.prefix ?? ''}`;
}

/** A byte-bounded LRU that also shares a load in flight between callers. */
export function byteCache<T extends object>(maxBytes: number, sizeOf: (value: T) => number) {
	const cache = new LRUCache<string, T>({
		maxSize: maxBytes,
		sizeCalculation: (v) => Math.max(1, sizeOf(v))
	});
	const loading = new Map<string, Promise<T>>();
	return {
		async get(key: string, load: () => Promise<T>): Promise<T> {
			const hit = cache.get(key);
			if (hit) return hit;
			let pending = loading.get(key);
			if (!pending) {
				pending = load()
					.then((value) => {
						// Larger than the whole cache: served, not kept.
						if (sizeOf(value) <= maxBytes) cache.set(key, value);
						return value;
					})
					.finally(() => loading.delete(key));
				loading.set(key, pending);
			}
			return pending;
		},
		/** Drops every entry whose key contains `part`. */
		forget(part: string): void {
			for (const key of [...cache.keys()]) if (key.includes(part)) cache.delete(key);
		},
		clear(): void {
			cache.clear();
		}
	};
}

const MiB = 1024 * 1024;
const indexes = byteCache<ChunkIndex>(32 * MiB, (i) => i.byteLength);
// A segment's bytes, and its capture-order columns once built (about as large again).
const segments = byteCache<Segment>(96 * MiB, (s) => s.count * 40 + 4096);
const chunks = byteCache<Chunk>(32 * MiB, (c) => c.count * 20 + c.data.byteLength);

export async function loadChunkIndex(storage: BlobStorage, indexKey: string): Promise<ChunkIndex> {
	return indexes.get(`${storeId(storage)}|${indexKey}`, async () =>
		ChunkIndex.fromBytes(await storage.getBytes(indexKey))
	);
}

/**
 * The capture's frames as a ChunkSource, reading segments and chunks through the caches (or around
 * them, `cache: false`, for one pass over everything: a first decode or an export).
 */
export async function openChunkSource(
	storage: BlobStorage,
	busIndexKey: string,
	options: { cache?: boolean } = {}
): Promise<ChunkSource> {
	const { indexKey, bus } = splitBusKey(busIndexKey);
	if (bus !== null) return busChunkSource(await openChunkSource(storage, indexKey, options), bus);
	const index = await loadChunkIndex(storage, indexKey);
	const folder = storeFolderOf(indexKey);
	const id = storeId(storage);
	const raw = chunkSource(index, {
		segment: (s) => storage.getBytes(segmentKey(folder, s)),
		range: (s, offset, length) => storage.getRange(segmentKey(folder, s), offset, length)
	});
	if (options.cache === false) return raw;
	return {
		index,
		segment: (s) =>
			segments.get(
				`${id}|${folder}${s}`,
				async () => new Segment(await storage.getBytes(segmentKey(folder, s)), index.keyId)
			),
		chunk: (c) => chunks.get(`${id}|${folder}c${c}`, () => raw.chunk(c))
	};
}

/** Forgets a capture's cached store (deleted, or as after a restart). */
export function forgetCaptureStore(captureId: string): void {
	indexes.forget(`/${captureId}/`);
	segments.forget(`/${captureId}/`);
	chunks.forget(`/${captureId}/`);
}

/** Drops every cached store (as after a restart; the benchmark and tests use it). */
export function clearCaptureStoreCaches(): void {
	indexes.clear();
	segments.clear();
	chunks.clear();
}

/** The whole capture as one FrameStore: for tests and small captures only (memory grows with the capture). */
export async function loadWholeCapture(
	storage: BlobStorage,
	indexKey: string
): Promise<FrameStore> {
	const source = await openChunkSource(storage, indexKey);
	const store = new FrameStore();
	store.origin = source.index.header.origin;
	for (let s = 0; s < source.index.segmentCount; s++) {
		const c = (await source.segment(s)).columns();
		for (let i = 0; i < c.count; i++)
			store.add(
				c.time[i],
				c.id[i],
				(c.flags[i] & 1) === 1,
				c.data.subarray(c.dataOffset[i], c.dataOffset[i] + c.length[i]),
				c.length[i]
			);
	}
	return store;
}
