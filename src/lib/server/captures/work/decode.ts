/**
 * The first decode of a capture with a map, in a capture worker: one pass over the segments
 * (chunked-decode.ts) gives every figure of the summary and a min/max pyramid per channel. Both are
 * stored in the decode's folder — the pyramids in one file, then `summary.json`, whose presence
 * means the decode is complete — so a decode is never computed twice, not even after a restart.
 */
import { decodeChunked } from '../../../can/capture/chunked-decode';
import { pyramidToBytes } from '../../../can/capture/pyramid';
import { compileMap } from '../../../can/decoder';
import type { CanMap } from '../../../can/map';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import { summarizeDecoding } from '../decode-summary';
import type { StoredDecode } from './tasks';

export const summaryKey = (folder: string) => `${folder}summary.json`;
export const pyramidsKey = (folder: string) => `${folder}pyramids.fwcp`;

async function* pieces(parts: Uint8Array[]): AsyncGenerator<Uint8Array> {
	yield* parts;
}

export async function runDecode(
	storage: BlobStorage,
	task: { indexKey: string; map: CanMap; folder: string }
): Promise<StoredDecode> {
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const decoding = await decodeChunked(source, compileMap(task.map));
	const parts = decoding.pyramids.map(pyramidToBytes);
	let offset = 0;
	const stored: StoredDecode = {
		format: 'framewright-decode@1',
		summary: summarizeDecoding(decoding),
		channels: decoding.channels.map((c, k) => {
			const entry = {
				firstTime: c.firstTime,
				lastTime: c.lastTime,
				pyramidOffset: offset,
				pyramidBytes: parts[k].byteLength
			};
			offset += parts[k].byteLength;
			return entry;
		})
	};
	await storage.put(pyramidsKey(task.folder), pieces(parts));
	await storage.put(
		summaryKey(task.folder),
		pieces([new TextEncoder().encode(JSON.stringify(stored))])
	);
	return stored;
}
