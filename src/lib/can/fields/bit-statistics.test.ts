import { describe, expect, it } from 'vitest';
import { FrameStore } from '../capture/frame-store';
import { referenceExtract, referencePositions } from '../testing/reference-bits';
import { seededRandom } from '../testing/seeded-random';
import { bitStatistics, fieldValues, modalFrameSet } from './bit-statistics';
import { framesById, idFramesFromPayloads } from './frames';

const bitOf = (p: Uint8Array, b: number) => (p[b >> 3] >> (b & 7)) & 1;

describe('bitStatistics', () => {
	it('counts ones, flips and joint flips of chain neighbours like a per-bit loop', () => {
		const rand = seededRandom(11);
		// Biased bytes so counts differ from bit to bit.
		const payloads = Array.from({ length: 300 }, () =>
			Uint8Array.from({ length: 5 }, () => rand.int(0, 255) & rand.int(0, 255))
		);
		const set = modalFrameSet(idFramesFromPayloads(1, false, new Float64Array(300), payloads));
		const stats = bitStatistics(set);
		for (let b = 0; b < 40; b++) {
			const ones = payloads.filter((p) => bitOf(p, b)).length;
			let flips = 0;
			for (let k = 1; k < 300; k++) flips += bitOf(payloads[k], b) ^ bitOf(payloads[k - 1], b);
			expect(stats.ones[b]).toBe(ones);
			expect(stats.flips[b]).toBe(flips);
			for (const order of ['little', 'big'] as const) {
				// The neighbour above bit b: the second bit of a 2-bit field starting at b (reference walk).
				const above = referencePositions(b, 2, order)[1];
				const both = order === 'little' ? stats.bothLittle : stats.bothBig;
				if (above < 0 || above >= 40) continue;
				let joint = 0;
				for (let k = 1; k < 300; k++) {
					const a = bitOf(payloads[k], b) ^ bitOf(payloads[k - 1], b);
					const c = bitOf(payloads[k], above) ^ bitOf(payloads[k - 1], above);
					joint += a & c;
				}
				expect(both[b], `${order} ${b}→${above}`).toBe(joint);
			}
		}
	});

	it('fieldValues reads fields like the slow reference extraction', () => {
		const rand = seededRandom(12);
		const payloads = Array.from({ length: 50 }, () => rand.bytes(8));
		const set = modalFrameSet(idFramesFromPayloads(1, false, new Float64Array(50), payloads));
		for (const [start, length, order] of [
			[0, 8, 'little'],
			[5, 13, 'little'],
			[20, 32, 'little'],
			[40, 16, 'big'],
			[61, 27, 'big']
		] as const) {
			const values = fieldValues(set, start, length, order);
			payloads.forEach((p, k) =>
				expect(values[k]).toBe(Number(referenceExtract(p, start, length, order)))
			);
		}
	});

	it('modalFrameSet keeps the frames of the commonest payload length', () => {
		const payloads = [
			Uint8Array.of(1, 2),
			Uint8Array.of(3),
			Uint8Array.of(4, 5),
			Uint8Array.of(6, 7)
		];
		const set = modalFrameSet(idFramesFromPayloads(1, false, [0, 1, 2, 3], payloads));
		expect(set.length).toBe(2);
		expect(Array.from(set.bytes)).toEqual([1, 2, 4, 5, 6, 7]);
		expect(Array.from(set.time)).toEqual([0, 2, 3]);
	});
});

describe('framesById', () => {
	it('groups a frame store by (ID, extended) in order, padding shorter payloads with zeros', () => {
		const store = new FrameStore();
		const rows: [number, number, boolean, number[]][] = [
			[0.0, 0x100, false, [1, 2, 3]],
			[0.1, 0x100, true, [9]],
			[0.2, 0x0ff, false, [7, 7]],
			[0.3, 0x100, false, [4]],
			[0.4, 0x100, false, [5, 6, 7, 8]]
		];
		for (const [t, id, ext, data] of rows)
			store.add(t, id, ext, Uint8Array.from(data), data.length);
		const groups = framesById(store);
		expect(groups.map((g) => [g.id, g.extended, g.count])).toEqual([
			[0x0ff, false, 1],
			[0x100, false, 3],
			[0x100, true, 1]
		]);
		const g = groups[1];
		expect(g.stride).toBe(4);
		expect(Array.from(g.length)).toEqual([3, 1, 4]);
		expect(Array.from(g.data)).toEqual([1, 2, 3, 0, 4, 0, 0, 0, 5, 6, 7, 8]);
		expect(Array.from(g.time)).toEqual([0.0, 0.3, 0.4]);
		expect(framesById(store, (id, ext) => id === 0x100 && !ext).map((x) => x.id)).toEqual([0x100]);
	});
});
