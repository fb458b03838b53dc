import { describe, expect, it } from 'vitest';
import { FLAG_EXTENDED, FLAG_FD, FrameStore } from './frame-store';

function sample(): FrameStore {
	const store = new FrameStore();
	// More frames than the initial capacity, so the arrays must grow.
	for (let i = 0; i < 3000; i++) {
		const length = [0, 3, 8, 64][i % 4];
		const data = Uint8Array.from({ length }, (_, k) => (i + k) & 0xff);
		store.add(i * 0.001, 0x100 + (i % 50), i % 3 === 0, data, length);
	}
	store.origin = { timeOrigin: 1718000000.5, epoch: true };
	return store;
}

describe('FrameStore', () => {
	it('keeps every field of every frame', () => {
		const store = sample();
		expect(store.count).toBe(3000);
		expect(store.time[2999]).toBeCloseTo(2.999, 12);
		expect(store.id[57]).toBe(0x100 + 7);
		expect(store.flags[3]).toBe(FLAG_EXTENDED | FLAG_FD); // 64 bytes, i % 3 === 0
		expect(store.flags[2]).toBe(0);
		expect(Array.from(store.payload(6))).toEqual([6, 7, 8, 9, 10, 11, 12, 13]);
		expect(store.data.length).toBe(750 * (0 + 3 + 8 + 64));
	});

	it('round-trips through one byte buffer', () => {
		const store = sample();
		const copy = FrameStore.fromBytes(store.toBytes());
		expect(copy.count).toBe(store.count);
		expect(copy.time).toEqual(store.time);
		expect(copy.id).toEqual(store.id);
		expect(copy.flags).toEqual(store.flags);
		expect(copy.length).toEqual(store.length);
		expect(copy.dataOffset).toEqual(store.dataOffset);
		expect(copy.data).toEqual(store.data);
		expect(copy.origin).toEqual({ timeOrigin: 1718000000.5, epoch: true });
		copy.add(3, 0x7ff, false, Uint8Array.of(1, 2), 2); // a reopened store still grows
		expect(Array.from(copy.payload(3000))).toEqual([1, 2]);
	});

	it('reads from an unaligned slice of a larger buffer', () => {
		const bytes = sample().toBytes();
		const padded = new Uint8Array(bytes.length + 3);
		padded.set(bytes, 3);
		expect(FrameStore.fromBytes(padded.subarray(3)).count).toBe(3000);
	});

	it('rejects damaged or foreign bytes with a clear message', () => {
		const bytes = sample().toBytes();
		expect(() => FrameStore.fromBytes(bytes.subarray(0, 10))).toThrow(/shorter than the header/);
		expect(() => FrameStore.fromBytes(bytes.subarray(0, bytes.length - 8))).toThrow(/damaged/);
		const foreign = bytes.slice();
		foreign[0] ^= 0xff;
		expect(() => FrameStore.fromBytes(foreign)).toThrow(/magic/);
	});

	it('round-trips an empty store', () => {
		expect(FrameStore.fromBytes(new FrameStore().toBytes()).count).toBe(0);
	});
});
