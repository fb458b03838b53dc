/**
 * Opens a processed capture's compact frame store from blob storage, keeping the last few in
 * memory (a small LRU) so views, decodes and exports of one capture do not read storage each time.
 * A capture is never re-parsed here: only the stored FrameStore bytes are read.
 */
import { FrameStore } from '../../can/capture/frame-store';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';

/** A few stores: a 1M-frame capture is about 30 MB in memory. */
const CACHE_SIZE = 4;
/** Keyed by store key (a new processing writes a new key), holding the load in flight too. */
const cache = new Map<string, Promise<FrameStore>>();

export async function loadFrameStore(
	services: Pick<Services, 'storage'>,
	capture: Pick<CaptureRow, 'id' | 'status' | 'store_key'>
): Promise<FrameStore> {
	if (capture.status !== 'ready' || capture.store_key === null) {
		throw new Problem(
			409,
			`The capture is not processed yet (status: ${capture.status}); process it first.`
		);
	}
	const key = capture.store_key;
	let entry = cache.get(key);
	if (entry) {
		cache.delete(key); // re-inserted below as the most recently used
	} else {
		entry = services.storage.getBytes(key).then((bytes) => FrameStore.fromBytes(bytes));
		entry.catch(() => cache.delete(key));
	}
	cache.set(key, entry);
	while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
	return entry;
}

/** Drops a deleted or reprocessed capture's store from the cache. */
export function forgetFrameStore(storeKey: string | null): void {
	if (storeKey !== null) cache.delete(storeKey);
}

/** Storage keys of a capture's blobs: `captures/<workspace>/<capture>/…`. */
export function captureKeys(workspaceId: string, captureId: string) {
	const folder = `captures/${workspaceId}/${captureId}`;
	return { raw: `${folder}/raw.csv`, store: `${folder}/frames.fwcs` };
}
