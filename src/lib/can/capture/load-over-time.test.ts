import { describe, expect, it } from 'vitest';
import { captureBusLoad } from '../busload';
import { referenceFrameBits } from '../testing/reference-frame-bits';
import { seededRandom } from '../testing/seeded-random';
import { FrameStore } from './frame-store';
import { loadOverTime } from './load-over-time';

describe('loadOverTime', () => {
	it('sums each frame’s exact bus bits (bit-by-bit reference + 3 intermission) and skips CAN FD frames', () => {
		const rand = seededRandom(42);
		const store = new FrameStore();
		const expectedBits: number[] = [];
		const times: number[] = [];
		for (let i = 0; i < 3000; i++) {
			const extended = rand.int(0, 1) === 1;
			const id = extended ? rand.int(0, 0x1fffffff) : rand.int(0, 0x7ff);
			const fd = i % 500 === 7;
			const data = rand.bytes(fd ? 12 : rand.int(0, 8));
			const time = i * 1e-3 + rand.next() * 1e-4;
			store.add(time, id, extended, data, data.length);
			times.push(time);
			// ISO 11898-1 frame + its stuff bits, counted one bit at a time; the intermission is 3 bits.
			if (!fd) {
				const ref = referenceFrameBits(id, extended, data);
				expectedBits.push(ref.bits + ref.stuffBits + 3);
			} else expectedBits.push(0);
		}
		const result = loadOverTime(store, 250_000, 0.1);
		expect(result.fdFramesSkipped).toBe(6);
		const expected = captureBusLoad(
			Float64Array.from(times),
			Float64Array.from(expectedBits),
			250_000,
			0.1
		);
		expect(result.windows).toEqual(expected);
		expect(result.peakPercent).toBe(Math.max(...expected.map((w) => w.percent)));
	});

	it('gives no windows for an empty capture', () => {
		expect(loadOverTime(new FrameStore(), 500_000).windows).toEqual([]);
	});
});
