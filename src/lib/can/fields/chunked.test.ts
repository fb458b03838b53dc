// idFramesFromChunks against framesById over the same frames in a whole-capture FrameStore (the
// reference: its own tests check it), on random captures cut into small segments.
import { describe, expect, it } from 'vitest';
import { ChunkIndex, ChunkStoreWriter } from '../capture/chunk-store';
import { chunkSource } from '../capture/chunked-decode';
import { FrameStore } from '../capture/frame-store';
import { seededRandom } from '../testing/seeded-random';
import { idFramesFromChunks } from './chunked';
import { framesById } from './frames';

function capture(seed: number, frames: number) {
	const rand = seededRandom(seed);
	const ids = Array.from({ length: rand.int(1, 12) }, () =>
		rand.next() < 0.3
			? { id: rand.int(0, 0x1fffffff), extended: true }
			: { id: rand.int(0, 0x7ff), extended: false }
	);
	const store = new FrameStore();
	const segments: Uint8Array[] = [];
	const writer = new ChunkStoreWriter({
		segmentFrames: 97,
		onSegment: (s, b) => (segments[s] = b)
	});
	let t = 0;
	for (let i = 0; i < frames; i++) {
		const { id, extended } = rand.pick(ids);
		t += rand.next() * 0.002;
		const data = rand.bytes(rand.pick([0, 3, 8, 8, 8, 12]));
		store.add(t, id, extended, data, data.length);
		writer.add(t, id, extended, data, data.length);
	}
	const index = ChunkIndex.fromBytes(writer.finish({ timeOrigin: 0, epoch: false }).toBytes());
	return { store, source: chunkSource(index, { segment: async (s) => segments[s] }) };
}

describe('idFramesFromChunks', () => {
	it.each([1, 2, 3])('equals framesById on random capture %i', async (seed) => {
		const { store, source } = capture(seed, 1500);
		expect(await idFramesFromChunks(source, () => true)).toEqual(framesById(store));
		const odd = (id: number) => id % 2 === 1;
		expect(await idFramesFromChunks(source, odd)).toEqual(framesById(store, odd));
	});
});
