import { describe, expect, it } from 'vitest';
import {
	fdFrameBits,
	fdFrameSeconds,
	fdNominalPhaseBits,
	fdPhaseBitsAt,
	fdWorstCasePhaseBits
} from './fd-frame-bits';
import { FD_LENGTHS, referenceFdFrame } from './testing/reference-fd-frame-bits';
import { seededRandom } from './testing/seeded-random';

function randomFrame(rand: ReturnType<typeof seededRandom>, length: number, extended: boolean) {
	const id = extended ? rand.int(0, 0x1fffffff) : rand.int(0, 0x7ff);
	// A third of the payloads are runs of equal bits, where stuffing is busiest.
	const runs = rand.int(0, 2) === 0;
	const data = runs
		? Uint8Array.from({ length }, () => rand.pick([0x00, 0xff, 0x0f, 0xf0]))
		: rand.bytes(length);
	return { id, data };
}

describe('fdFrameBits against a bit-by-bit reference of the ISO 11898-1:2015 FD layout', () => {
	it('agrees on thousands of random frames, every FD length, both ID formats, with and without BRS', () => {
		const rand = seededRandom(20150);
		let stuffedAtEnd = 0;
		for (let t = 0; t < 6400; t++) {
			const length = FD_LENGTHS[t % 16];
			const extended = (t >> 4) % 2 === 1;
			const brs = (t >> 5) % 2 === 1;
			const { id, data } = randomFrame(rand, length, extended);
			const ref = referenceFdFrame(id, extended, data, brs);
			const { wire, dynamicEnd, brsIndex, delimiterIndex, stuffedAtEnd: atEnd, ...expected } = ref;
			expect(fdFrameBits(id, extended, data, { bitRateSwitch: brs })).toEqual(expected);
			if (atEnd) stuffedAtEnd++;
			// The stuffed part never holds 6 equal bits; the whole frame is as long as its parts.
			expect(wire.slice(0, dynamicEnd)).not.toMatch(/000000|111111/);
			expect(wire.length).toBe(expected.bits + expected.stuffBits + expected.fixedStuffBits);
			expect(expected.arbitrationBits + expected.dataPhaseBits).toBe(wire.length);
			expect(brsIndex === -1 || delimiterIndex > brsIndex).toBe(true);
		}
		// The case of a dynamic stuff bit right before the first fixed stuff bit was exercised.
		expect(stuffedAtEnd).toBeGreaterThan(50);
	});

	it('fdPhaseBitsAt reads a payload pool with the same phase counts', () => {
		const rand = seededRandom(77);
		const pool = Uint8Array.from({ length: 8192 }, (_, i) =>
			i % 200 < 100 ? rand.int(0, 255) : rand.pick([0, 255])
		);
		for (let t = 0; t < 3000; t++) {
			const length = FD_LENGTHS[rand.int(0, 15)];
			const extended = rand.int(0, 1) === 1;
			const brs = rand.int(0, 1) === 1;
			const id = extended ? rand.int(0, 0x1fffffff) : rand.int(0, 0x7ff);
			const offset = rand.int(0, pool.length - length);
			const ref = referenceFdFrame(id, extended, pool.slice(offset, offset + length), brs);
			expect(fdPhaseBitsAt(id, extended, pool, offset, length, { bitRateSwitch: brs })).toEqual({
				arbitrationBits: ref.arbitrationBits,
				dataPhaseBits: ref.dataPhaseBits
			});
		}
		expect(() => fdPhaseBitsAt(1, false, pool, 8190, 12, { bitRateSwitch: true })).toThrow(
			/outside a pool of 8192 bytes/
		);
	});

	it('covers the extreme identifiers and payloads of every length', () => {
		const ids = { false: [0, 0x7ff, 0x555], true: [0, 0x1fffffff, 0x3ffff, 0x40000] };
		for (const extended of [false, true]) {
			for (const id of ids[`${extended}`]) {
				for (const length of FD_LENGTHS) {
					for (const fill of [0x00, 0xff, 0x55, 0x0f, 0x83]) {
						for (const brs of [false, true]) {
							const data = new Uint8Array(length).fill(fill);
							const { bits, stuffBits, fixedStuffBits, crc, arbitrationBits, dataPhaseBits } =
								referenceFdFrame(id, extended, data, brs);
							expect(fdFrameBits(id, extended, data, { bitRateSwitch: brs })).toMatchObject({
								bits,
								stuffBits,
								fixedStuffBits,
								crc,
								arbitrationBits,
								dataPhaseBits
							});
						}
					}
				}
			}
		}
	});
});

describe('FD frame layout by hand (ISO 11898-1:2015 field widths)', () => {
	it.each(FD_LENGTHS)(
		'%d data bytes: 53+8n (base) / 72+8n (extended) unstuffed bits with CRC-17, 4 more with CRC-21',
		(n) => {
			// base: SOF 1, ID 11, RRS, IDE, FDF, res, BRS, ESI 6, DLC 4 = 22; stuff count 4; CRC 17|21;
			// delimiter, ACK slot, ACK delimiter, EOF 7 = 10 → 36 + 8n + CRC. Extended adds SRR, IDE and
			// the 18-bit extension and drops nothing else (RRS stays): 41 header bits → 55 + 8n + CRC.
			const crcWidth = n <= 16 ? 17 : 21;
			const data = new Uint8Array(n).fill(0xa5);
			const base = fdFrameBits(0x123, false, data, { bitRateSwitch: true });
			const ext = fdFrameBits(0x1234567, true, data, { bitRateSwitch: true });
			expect(base.bits).toBe(36 + 8 * n + crcWidth);
			expect(ext.bits).toBe(55 + 8 * n + crcWidth);
			expect(base.crcWidth).toBe(crcWidth);
			// Fixed stuff bits: before the stuff count and after every 4th of its 4 + w bits: 6 or 7.
			expect(base.fixedStuffBits).toBe(crcWidth === 17 ? 6 : 7);
		}
	);

	it('counts a worked example: base ID 0, no data, no BRS', () => {
		// SOF + ID + RRS + IDE = 14 dominant bits → 00000[1]00000[1]0000, then FDF=1, then res, BRS,
		// ESI, DLC 0000 = 7 dominant bits → 00000[1]00: 3 dynamic stuff bits. Stuff count 3 → Gray 010,
		// parity 1. 53 unstuffed + 3 dynamic + 6 fixed = 62 bits, all at the nominal rate.
		const f = fdFrameBits(0, false, new Uint8Array(0), { bitRateSwitch: false });
		expect(f).toMatchObject({
			bits: 53,
			stuffBits: 3,
			fixedStuffBits: 6,
			stuffCount: 3,
			arbitrationBits: 62,
			dataPhaseBits: 0
		});
		// With BRS recessive the run after FDF is res alone, then ESI + DLC = 5 dominant bits: one stuff bit
		// after BRS (data phase). Nominal rate: SOF … BRS = 17 bits + 2 stuff bits, then ACK, delimiter, EOF = 9.
		const g = fdFrameBits(0, false, new Uint8Array(0), { bitRateSwitch: true });
		expect(g).toMatchObject({ stuffBits: 3, arbitrationBits: 17 + 2 + 9, dataPhaseBits: 62 - 28 });
	});

	it('rejects lengths no FD frame has and IDs out of range, with clear messages', () => {
		const opts = { bitRateSwitch: true };
		expect(() => fdFrameBits(1, false, new Uint8Array(9), opts)).toThrow(/0–8, 12, 16/);
		expect(() => fdFrameBits(1, false, new Uint8Array(65), opts)).toThrow(/got 65/);
		expect(() => fdFrameBits(0x800, false, new Uint8Array(12), opts)).toThrow(/0…0x7FF/);
		expect(() => fdNominalPhaseBits(13, false, opts)).toThrow(/got 13/);
	});
});

describe('FD frame duration with two bit rates', () => {
	it('equals a sample-point model of the bit rate switch for any sample points (ISO 11898-1:2015)', () => {
		// The rate switches at the sample point of BRS and back at the sample point of the CRC delimiter:
		// BRS lasts spN·Tn + (1 − spD)·Td, the delimiter spD·Td + (1 − spN)·Tn.
		const rand = seededRandom(5);
		for (let t = 0; t < 200; t++) {
			const length = FD_LENGTHS[rand.int(0, 15)];
			const extended = rand.int(0, 1) === 1;
			const { id, data } = randomFrame(rand, length, extended);
			const ref = referenceFdFrame(id, extended, data, true);
			const [nominal, dataRate] = rand.pick([
				[500_000, 2_000_000],
				[250_000, 1_000_000],
				[1_000_000, 5_000_000],
				[500_000, 500_000]
			]);
			const tn = 1 / nominal;
			const td = 1 / dataRate;
			const spN = rand.pick([0.7, 0.8, 0.875]);
			const spD = rand.pick([0.6, 0.75, 0.8]);
			let seconds = 0;
			for (let i = 0; i < ref.wire.length; i++) {
				if (i < ref.brsIndex || i > ref.delimiterIndex) seconds += tn;
				else if (i === ref.brsIndex) seconds += spN * tn + (1 - spD) * td;
				else if (i === ref.delimiterIndex) seconds += spD * td + (1 - spN) * tn;
				else seconds += td;
			}
			const bits = fdFrameBits(id, extended, data, { bitRateSwitch: true });
			expect(fdFrameSeconds(bits, nominal, dataRate)).toBeCloseTo(seconds, 15);
		}
	});

	it('a 64-byte base frame at 500 kbit/s and 2 Mbit/s: hand arithmetic from the counts', () => {
		const bits = fdFrameBits(0x100, false, new Uint8Array(64), { bitRateSwitch: true });
		// All-zero payload: 512 zeros → one stuff bit per 4 after the first 5, see the reference test.
		const seconds = bits.arbitrationBits / 500_000 + bits.dataPhaseBits / 2_000_000;
		expect(fdFrameSeconds(bits, 500_000, 2_000_000)).toBe(seconds);
		// Without a switch, the same frame (BRS dominant) takes its whole length at 500 kbit/s.
		const slow = fdFrameBits(0x100, false, new Uint8Array(64), { bitRateSwitch: false });
		expect(fdFrameSeconds(slow, 500_000, 2_000_000)).toBe(
			(slow.bits + slow.stuffBits + slow.fixedStuffBits) / 500_000
		);
	});
});

describe('nominal and worst-case FD phase bits', () => {
	it('bound every random frame from below and above, in bits and in seconds', () => {
		const rand = seededRandom(404);
		for (let t = 0; t < 3000; t++) {
			const length = FD_LENGTHS[t % 16];
			const extended = rand.int(0, 1) === 1;
			const brs = rand.int(0, 1) === 1;
			const { id, data } = randomFrame(rand, length, extended);
			const f = fdFrameBits(id, extended, data, { bitRateSwitch: brs });
			const low = fdNominalPhaseBits(length, extended, { bitRateSwitch: brs });
			const high = fdWorstCasePhaseBits(length, extended, { bitRateSwitch: brs });
			expect(low.arbitrationBits + low.dataPhaseBits).toBe(f.bits + f.fixedStuffBits);
			expect(f.arbitrationBits + f.dataPhaseBits).toBeLessThanOrEqual(
				high.arbitrationBits + high.dataPhaseBits
			);
			expect(f.arbitrationBits).toBeLessThanOrEqual(high.arbitrationBits);
			for (const [n, d] of [
				[500_000, 2_000_000],
				[500_000, 500_000]
			]) {
				expect(fdFrameSeconds(f, n, d)).toBeGreaterThanOrEqual(fdFrameSeconds(low, n, d));
				expect(fdFrameSeconds(f, n, d)).toBeLessThanOrEqual(fdFrameSeconds(high, n, d));
			}
		}
	});

	it('worst case = unstuffed + fixed + ⌊(L − 1)/4⌋ dynamic stuff bits (Davis et al. 2007 argument)', () => {
		// 64 bytes base: L = 22 + 512 = 534 → 133 stuff bits; 569 + 7 + 133 = 709 bits. With BRS, at most
		// ⌊(16 − 1)/4⌋ = 3 of them before BRS: nominal rate 17 + 3 + 9 = 29 bits, data rate 680.
		expect(fdWorstCasePhaseBits(64, false, { bitRateSwitch: true })).toEqual({
			arbitrationBits: 29,
			dataPhaseBits: 680
		});
		// 0 bytes extended: L = 41 → 10 stuff bits; 72 + 6 + 10 = 88 bits; before BRS ⌊34/4⌋ = 8:
		// nominal rate 36 + 8 + 9 = 53, data rate 35.
		expect(fdWorstCasePhaseBits(0, true, { bitRateSwitch: true })).toEqual({
			arbitrationBits: 53,
			dataPhaseBits: 35
		});
		expect(fdWorstCasePhaseBits(0, true, { bitRateSwitch: false })).toEqual({
			arbitrationBits: 88,
			dataPhaseBits: 0
		});
	});
});
