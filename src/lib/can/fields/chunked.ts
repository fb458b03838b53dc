/**
 * The frames of chosen IDs straight from a chunked capture (chunk-store.ts): each ID's chunks are
 * read in capture order and copied into one IdFrames, so only those IDs' frames are ever in memory
 * and no segment is rebuilt. Gives what framesById gives over the whole capture (the test compares).
 */
import type { ChunkSource } from '../capture/chunked-decode';
import type { IdFrames } from './frames';

/** Frames of every ID `select` keeps, sorted by (extended, id) like framesById. */
export async function idFramesFromChunks(
	source: ChunkSource,
	select: (id: number, extended: boolean) => boolean
): Promise<IdFrames[]> {
	const { index } = source;
	const out: IdFrames[] = [];
	for (let k = 0; k < index.keyId.length; k++) {
		const id = index.keyId[k];
		const extended = index.keyExtended[k] === 1;
		if (!select(id, extended)) continue;
		const first = index.keyChunkStart[k];
		const end = index.keyChunkStart[k + 1];
		const chunks = [];
		let count = 0;
		let stride = 0;
		for (let c = first; c < end; c++) {
			const chunk = await source.chunk(c);
			chunks.push(chunk);
			count += chunk.count;
			for (let i = 0; i < chunk.count; i++) if (chunk.length[i] > stride) stride = chunk.length[i];
		}
		const time = new Float64Array(count);
		const length = new Uint8Array(count);
		const data = new Uint8Array(count * stride);
		let at = 0;
		for (const chunk of chunks) {
			time.set(chunk.time, at);
			length.set(chunk.length, at);
			for (let i = 0; i < chunk.count; i++) {
				const from = chunk.dataOffset[i];
				data.set(chunk.data.subarray(from, from + chunk.length[i]), (at + i) * stride);
			}
			at += chunk.count;
		}
		out.push({ id, extended, count, time, length, stride, data });
	}
	return out.sort((a, b) => Number(a.extended) - Number(b.extended) || a.id - b.id);
}
