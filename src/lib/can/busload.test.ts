import { describe, expect, it } from 'vitest';
import { captureBusLoad, frameBusBits, mapBusLoad } from './busload';
import { canMapSchema } from './map';
import { referenceFrameBits } from './testing/reference-frame-bits';

// Demo map (invented), two periodic frames, one event frame and one CAN FD frame.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Bus load arithmetic',
	bitrate: 500_000,
	frames: [
		{ name: 'Fast', id: '0x100', length: 8, cycleMs: 10 },
		{ name: 'Slow', id: '0x18FF1234', extended: true, length: 4, cycleMs: 100 },
		{ name: 'OnChange', id: '0x200', length: 2, cycleMs: null },
		{ name: 'Wide', id: '0x300', length: 64, cycleMs: 10 }
	]
});

describe('mapBusLoad', () => {
	it('matches the hand arithmetic for two classical frames (ISO 11898-1 bit counts, Davis et al. 2007 bound)', () => {
		// Fast: base, 8 bytes, 100 /s. Nominal 44+8·8 = 108 bits + 3 intermission = 111 → 11 100 bit/s.
		//       Worst (Davis) 34+64+13+⌊97/4⌋ = 135 → 13 500 bit/s.
		// Slow: extended, 4 bytes, 10 /s. Nominal 64+8·4 = 96 + 3 = 99 → 990 bit/s.
		//       Worst 54+32+13+⌊85/4⌋ = 120 → 1 200 bit/s.
		// Classical totals at 500 kbit/s: nominal 12 090 / 500 000 = 2.418 %, worst 14 700 / 500 000 = 2.94 %.
		const load = mapBusLoad(map);
		expect(load.frames[0]).toMatchObject({
			framesPerSecond: 100,
			nominalBitsPerSecond: 11_100,
			worstCaseBitsPerSecond: 13_500,
			excluded: null
		});
		expect(load.frames[1]).toMatchObject({
			framesPerSecond: 10,
			nominalBitsPerSecond: 990,
			worstCaseBitsPerSecond: 1_200
		});
		expect(load.frames[0].nominalPercent).toBeCloseTo(2.22, 10);
		expect(load.frames[1].worstCasePercent).toBeCloseTo(0.24, 10);
		const classical = mapBusLoad({ ...map, frames: map.frames.slice(0, 3) });
		expect(classical.nominalPercent).toBeCloseTo(2.418, 10);
		expect(classical.worstCasePercent).toBeCloseTo(2.94, 10);
	});

	it('counts a CAN FD frame at the nominal rate when no data bit rate is given (ISO 11898-1:2015 layout)', () => {
		// Wide: base, 64 bytes, 100 /s. SOF…DLC 22 + data 512 + stuff count 4 + CRC-21 21 + delimiter, ACK,
		// EOF 10 = 569 bits, + 7 fixed stuff bits = 576, + 3 intermission = 579 → 57 900 bit/s.
		// Worst: + ⌊(22 + 512 − 1)/4⌋ = 133 dynamic stuff bits → 712 → 71 200 bit/s.
		// Totals: nominal 12 090 + 57 900 = 69 990 → 13.998 %; worst 14 700 + 71 200 = 85 900 → 17.18 %.
		const load = mapBusLoad(map);
		expect(load.dataBitrate).toBe(500_000);
		expect(load.frames[3]).toMatchObject({
			name: 'Wide',
			excluded: null,
			nominalBitsPerSecond: 57_900,
			worstCaseBitsPerSecond: 71_200
		});
		expect(load.nominalPercent).toBeCloseTo(13.998, 10);
		expect(load.worstCasePercent).toBeCloseTo(17.18, 10);
	});

	it('runs the FD data phase at the data bit rate', () => {
		// Wide at 500 kbit/s nominal, 2 Mbit/s data. Nominal rate: SOF…BRS 17 + ACK slot, ACK delimiter,
		// EOF 9 = 26 bits + 3 intermission; data rate: the other 576 − 26 = 550 bits = 137.5 nominal bit
		// times → 166.5 × 100 = 16 650. Worst: at most ⌊(16 − 1)/4⌋ = 3 stuff bits before BRS, the other
		// 130 after: 29 + 3 + (709 − 29)/4 = 202 → 20 200.
		const load = mapBusLoad(map, 500_000, 2_000_000);
		expect(load.dataBitrate).toBe(2_000_000);
		expect(load.frames[3].nominalBitsPerSecond).toBeCloseTo(16_650, 9);
		expect(load.frames[3].worstCaseBitsPerSecond).toBeCloseTo(20_200, 9);
		// Classical frames are untouched by the data bit rate.
		expect(load.frames[0]).toEqual(mapBusLoad(map).frames[0]);
		expect(load.nominalPercent).toBeCloseTo((100 * (12_090 + 16_650)) / 500_000, 10);
	});

	it('lists frames without a cycle time with zero load', () => {
		const load = mapBusLoad(map);
		expect(load.frames[2]).toMatchObject({
			name: 'OnChange',
			framesPerSecond: 0,
			nominalPercent: 0,
			excluded: 'noCycleTime'
		});
	});

	it('uses the given bit rate instead of the map’s', () => {
		// Same 12 090 bit/s of classical frames on a 250 kbit/s bus: 4.836 %.
		const classical = { ...map, frames: map.frames.slice(0, 3) };
		expect(mapBusLoad(classical, 250_000).nominalPercent).toBeCloseTo(4.836, 10);
		expect(() => mapBusLoad(map, 0)).toThrow(/bit rate/);
		expect(() => mapBusLoad(map, 500_000, 250_000)).toThrow(
			/data bit rate \(250000\) must be at least the nominal bit rate \(500000\)/
		);
	});
});

describe('captureBusLoad', () => {
	it('sums each window’s frame bits against its capacity', () => {
		// 1 s windows at 125 kbit/s: window 0 holds 1000 + 250 bits = 1.0 %, window 1 is empty,
		// window 2 holds 12 500 bits = 10 %.
		const times = Float64Array.of(10.0, 10.5, 12.9);
		const bits = Float64Array.of(1000, 250, 12_500);
		expect(captureBusLoad(times, bits, 125_000, 1)).toEqual([
			{ start: 10, percent: 1 },
			{ start: 11, percent: 0 },
			{ start: 12, percent: 10 }
		]);
	});

	it('counts a real frame as its bits, its own stuff bits and the 3-bit intermission (ISO 11898-1)', () => {
		// Reference: each frame spelled out bit by bit from the ISO 11898-1 fields, its CRC by polynomial
		// long division and its stuff bits counted one at a time (testing/reference-frame-bits.ts).
		const frames: [number, boolean, number[]][] = [
			[0, false, [0, 0, 0, 0, 0, 0, 0, 0]],
			[0x7ff, false, []],
			[0x123, false, [0x11, 0x22, 0x33]],
			[0x18fef100, true, [0xff, 0xff, 0, 0, 0x0f, 0xf0, 0x55, 0xaa]]
		];
		for (const [id, extended, bytes] of frames) {
			const ref = referenceFrameBits(id, extended, Uint8Array.from(bytes));
			expect(frameBusBits(id, extended, Uint8Array.from(bytes))).toBe(ref.bits + ref.stuffBits + 3);
		}
		// The published bounds for an 8-byte base frame: at least 108 unstuffed bits + 3 (ISO 11898-1),
		// at most 135 with the intermission (Davis et al. 2007).
		const n = frameBusBits(0, false, new Uint8Array(8));
		expect(n).toBeGreaterThan(108 + 3);
		expect(n).toBeLessThanOrEqual(135);
		// 1000 such frames in one second fill a bus of 1000·n bit/s exactly (100 %) and half of one twice as fast.
		const times = new Float64Array(1000).map((_, i) => i / 1000);
		const bits = new Float64Array(1000).fill(n);
		expect(captureBusLoad(times, bits, 1000 * n, 1)).toEqual([{ start: 0, percent: 100 }]);
		expect(captureBusLoad(times, bits, 2000 * n, 1)).toEqual([{ start: 0, percent: 50 }]);
	});

	it('rejects mismatched inputs and absurd windows', () => {
		expect(() => captureBusLoad(Float64Array.of(0), new Float64Array(2), 500_000, 1)).toThrow(
			/same length/
		);
		expect(() => captureBusLoad(Float64Array.of(0, 1e9), new Float64Array(2), 500_000, 1)).toThrow(
			/windows/
		);
		expect(() => captureBusLoad(Float64Array.of(0), new Float64Array(1), 500_000, 0)).toThrow(
			/window/
		);
		expect(captureBusLoad(new Float64Array(0), new Float64Array(0), 500_000, 1)).toEqual([]);
	});
});
