// Per-bus figures of a capture of two buses: each bus's load and ID statistics from its own frames.
// References: the ISO 11898-1 frame spelled out bit by bit (testing/reference-frame-bits.ts) and
// hand arithmetic of rates; the frames are invented demo data.
import { describe, expect, it } from 'vitest';
import { compileMap } from '../decoder';
import { canMapSchema } from '../map';
import { referenceFrameBits } from '../testing/reference-frame-bits';
import { createBusLoadCounters } from './bus-load-per-bus';
import { framesOnBus } from './bus-source';
import { FrameStore } from './frame-store';
import { createIdSurvey } from './id-statistics';

/** Two buses: bus 0 has 0x100 every 10 ms, bus 1 has 0x100 every 20 ms (same ID, other bus). */
function twoBuses() {
	const store = new FrameStore();
	const bus: number[] = [];
	for (let k = 0; k < 10; k++) {
		store.add(k * 0.01, 0x100, false, Uint8Array.of(1, 2, 3, k), 4);
		bus.push(0);
		if (k % 2 === 0) {
			store.add(k * 0.01, 0x100, false, Uint8Array.of(0xff, k), 2);
			bus.push(1);
		}
	}
	const columns = {
		count: store.count,
		time: store.time,
		id: store.id,
		flags: store.flags,
		length: store.length,
		dataOffset: store.dataOffset,
		data: store.data,
		bus: Uint8Array.from(bus)
	};
	return columns;
}

describe('per-bus figures', () => {
	it('splits frames by bus in capture order', () => {
		const columns = twoBuses();
		const one = framesOnBus(columns, 1);
		expect(one.count).toBe(5);
		expect(Array.from(one.time)).toEqual([0, 0.02, 0.04, 0.06, 0.08]);
		expect(
			Array.from(one.data.subarray(one.dataOffset[2], one.dataOffset[2] + one.length[2]))
		).toEqual([0xff, 4]);
	});

	it('counts each bus’s load from its own frames (ISO 11898-1 bit counts)', () => {
		const columns = twoBuses();
		const counters = createBusLoadCounters({ busCount: 2, bitrate: 125_000, first: 0, last: 0.09 });
		counters.add(columns);
		const [a, b] = counters.finish();
		let bitsA = 0;
		for (let k = 0; k < 10; k++) {
			const r = referenceFrameBits(0x100, false, Uint8Array.of(1, 2, 3, k));
			bitsA += r.bits + r.stuffBits + 3;
		}
		let bitsB = 0;
		for (let k = 0; k < 10; k += 2) {
			const r = referenceFrameBits(0x100, false, Uint8Array.of(0xff, k));
			bitsB += r.bits + r.stuffBits + 3;
		}
		expect(a.frames).toBe(10);
		expect(b.frames).toBe(5);
		expect(a.load.windows[0].percent).toBeCloseTo((100 * bitsA) / (125_000 * 0.1), 9);
		expect(b.load.windows[0].percent).toBeCloseTo((100 * bitsB) / (125_000 * 0.1), 9);
	});

	it('keeps one ID on two buses as two entries with their own rates', () => {
		const survey = createIdSurvey(
			compileMap(canMapSchema.parse({ format: 'framewright-map@1', name: 'Empty', frames: [] }))
		);
		survey.add(twoBuses());
		const { ids, unknownIds } = survey.finish();
		expect(ids.map((s) => [s.bus, s.id, s.count])).toEqual([
			[0, 0x100, 10],
			[1, 0x100, 5]
		]);
		// 9 gaps over 0.09 s = 100 Hz; 4 gaps over 0.08 s = 50 Hz.
		expect(ids[0].rateHz).toBeCloseTo(100, 9);
		expect(ids[1].rateHz).toBeCloseTo(50, 9);
		expect(unknownIds.map((u) => u.bus)).toEqual([0, 1]);
	});
});
