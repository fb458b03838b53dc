import { describe, expect, it } from 'vitest';
import {
	applyStuffing,
	countStuffBits,
	frameBits,
	frameBitSequence,
	frameStuffBitsAt,
	interFrameBits,
	maxStuffBits,
	nominalFrameBits,
	worstCaseFrameBits
} from './frame-bits';
import { referenceCrc15, referenceFrameBits } from './testing/reference-frame-bits';

/** Deterministic pseudo-random bytes (LCG, Numerical Recipes constants) so failures reproduce. */
function lcg(seed: number) {
	return () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) >>> 24;
}

/** A random 11- or 29-bit identifier from byte-sized random numbers. */
function randomId(rand: () => number, extended: boolean): number {
	const wide = rand() * 0x200000 + rand() * 0x2000 + rand() * 0x20 + (rand() >> 3); // ≤ 0x1FFFFFFF
	return extended ? wide : wide & 0x7ff;
}

const str = (bits: ArrayLike<number>) => Array.from(bits).join('');

describe('frameBits (ISO 11898-1 classical data frames)', () => {
	it.each([0, 1, 2, 3, 4, 5, 6, 7, 8])('%d data bytes: 44+8n base, 64+8n extended bits', (n) => {
		// ISO 11898-1 field widths: base 1+11+1+1+1+4+8n+15+1+1+1+7 = 44+8n; extended adds SRR, IDE→
		// SRR+IDE+18-bit extension+r1 = 20 more bits → 64+8n.
		const data = new Uint8Array(n).fill(0x5a);
		expect(frameBits(0x123, false, data).bits).toBe(44 + 8 * n);
		expect(frameBits(0x1abcdef0, true, data).bits).toBe(64 + 8 * n);
		expect(nominalFrameBits(n, false)).toBe(44 + 8 * n);
		expect(nominalFrameBits(n, true)).toBe(64 + 8 * n);
	});

	it('lays out base-format fields in ISO 11898-1 order', () => {
		const seq = frameBitSequence(0x123, false, Uint8Array.of(0xaa));
		const crc = seq.crc.toString(2).padStart(15, '0');
		// SOF | ID 0x123 | RTR IDE r0 | DLC 1 | 0xAA | CRC | CRC delim, ACK slot, ACK delim, EOF×7
		expect(str(seq.bits)).toBe(
			'0' + '00100100011' + '000' + '0001' + '10101010' + crc + '1'.repeat(10)
		);
		expect(seq.stuffedLength).toBe(1 + 11 + 3 + 4 + 8 + 15);
	});

	it('lays out extended-format fields in ISO 11898-1 order', () => {
		const id = 0x18feee00; // base = top 11 bits, extension = low 18 bits
		const seq = frameBitSequence(id, true, new Uint8Array(0));
		const base = (id >>> 18).toString(2).padStart(11, '0');
		const ext = (id & 0x3ffff).toString(2).padStart(18, '0');
		const crc = seq.crc.toString(2).padStart(15, '0');
		// SOF | base ID | SRR=1 IDE=1 | ID extension | RTR r1 r0 | DLC 0 | CRC | trailer
		expect(str(seq.bits)).toBe('0' + base + '11' + ext + '000' + '0000' + crc + '1'.repeat(10));
	});

	it('CRC equals a BigInt polynomial long division over SOF…data (random frames)', () => {
		const rand = lcg(7);
		for (let t = 0; t < 300; t++) {
			const extended = t % 2 === 1;
			const id = randomId(rand, extended);
			const data = Uint8Array.from({ length: t % 9 }, rand);
			const seq = frameBitSequence(id, extended, data);
			expect(seq.crc).toBe(referenceCrc15(seq.bits.subarray(0, seq.stuffedLength - 15)));
			expect(frameBits(id, extended, data).crc).toBe(seq.crc);
		}
	});

	it('rejects IDs out of range and payloads beyond 8 bytes with clear messages', () => {
		expect(() => frameBits(0x800, false, new Uint8Array(1))).toThrow(/0…0x7FF/);
		expect(() => frameBits(0x20000000, true, new Uint8Array(1))).toThrow(/0x1FFFFFFF/);
		expect(() => frameBits(1, false, new Uint8Array(9))).toThrow(/0–8 data bytes/);
	});
});

describe('bit stuffing (ISO 11898-1: a complement after 5 equal bits, stuff bits count in runs)', () => {
	it.each([
		['00000', 1],
		['0000', 0],
		['000010000', 0],
		['0000011110000', 3], // 00000[1] 1111 → run of 5 with the stuff bit [0] 0000 → [1]
		['0000000000', 2], // 00000[1] 00000[1]
		['1111111111', 2],
		['000001', 1], // the stuff bit 1 plus one 1 is a run of 2, no second stuff
		['01010101', 0]
	])('%s needs %d stuff bits', (pattern, expected) => {
		const bits = Array.from(pattern, Number);
		expect(countStuffBits(bits)).toBe(expected);
		expect(applyStuffing(bits).length).toBe(bits.length + expected);
	});

	it('shows the stuffed stream of a hand-made pattern', () => {
		expect(str(applyStuffing(Array.from('0000011110000', Number)))).toBe(
			'00000' + '1' + '1111' + '0' + '0000' + '1'
		);
	});

	it('a stuffed random frame never has 6 equal bits in a row and fits the Davis bound', () => {
		const rand = lcg(2024);
		let maxSeen = 0;
		for (let t = 0; t < 4000; t++) {
			const extended = t % 2 === 1;
			const n = t % 9;
			// Biased payloads (mostly 0x00/0xFF runs) reach far more stuff bits than uniform ones.
			const data = Uint8Array.from({ length: n }, () =>
				t % 3 === 0 ? rand() : rand() < 128 ? 0x0f : 0xf0
			);
			const id = randomId(rand, extended);
			const seq = frameBitSequence(id, extended, data);
			const { bits, stuffBits } = frameBits(id, extended, data);
			const wire = str(applyStuffing(seq.bits.subarray(0, seq.stuffedLength)));
			expect(wire).not.toMatch(/000000|111111/);
			expect(wire.length).toBe(seq.stuffedLength + stuffBits);
			expect(bits + stuffBits + interFrameBits).toBeLessThanOrEqual(
				worstCaseFrameBits(n, extended)
			);
			maxSeen = Math.max(maxSeen, stuffBits);
		}
		expect(maxSeen).toBeGreaterThan(10);
	});
});

/**
 * Most stuff bits any bit string of `length` bits needs (ISO 11898-1: after five equal bits a
 * complement is inserted, and it counts towards the next run). Exact, by dynamic programming over
 * (last bit, length of the current run): the best count reachable after each bit.
 */
function maxStuffOver(length: number): number {
	// best[last][run - 1] = most stuff bits so far when the stream ends in `run` equal bits `last`.
	let best = [
		[0, -Infinity, -Infinity, -Infinity, -Infinity],
		[-Infinity, -Infinity, -Infinity, -Infinity, -Infinity]
	]; // the first bit: either value, a run of one (symmetric, so only 0 is needed)
	for (let i = 1; i < length; i++) {
		const next = [0, 1].map(() => new Array<number>(5).fill(-Infinity));
		for (const last of [0, 1]) {
			for (let run = 1; run <= 5; run++) {
				const count = best[last][run - 1];
				if (count === -Infinity) continue;
				// The same bit again: the run grows; at five a stuff bit of the other value follows.
				if (run + 1 === 5) {
					const stuffedTo = 1 - last;
					next[stuffedTo][0] = Math.max(next[stuffedTo][0], count + 1);
				} else next[last][run] = Math.max(next[last][run], count);
				// The other bit: a new run of one.
				next[1 - last][0] = Math.max(next[1 - last][0], count);
			}
		}
		best = next;
	}
	return Math.max(...best.flat());
}

describe('worstCaseFrameBits (Davis, Burns, Bril, Lukkien 2007, eq. 1)', () => {
	it.each([
		// C = g + 8n + 13 + ⌊(g + 8n − 1)/4⌋, g = 34 base / 54 extended; 13 includes the 3-bit intermission.
		[8, false, 135], // the paper's 135 bits for an 8-byte base-format frame
		[8, true, 160],
		[0, false, 55], // 34 + 13 + ⌊33/4⌋ = 47 + 8
		[0, true, 80], // 54 + 13 + ⌊53/4⌋ = 67 + 13
		[4, false, 95] // 66 + 13 + ⌊65/4⌋ = 79 + 16
	] as const)('%d bytes, extended %s → %d bits', (n, extended, expected) => {
		expect(worstCaseFrameBits(n, extended)).toBe(expected);
	});

	it('equals the ISO 11898-1 frame, the most stuff bits any bit string of its stuffed length can need, and the intermission', () => {
		// Independent of the paper's closed form: the field widths of ISO 11898-1 are added up here, and
		// the worst stuffing is found by a search over every bit string of that length (maxStuffOver).
		for (let n = 0; n <= 8; n++) {
			for (const extended of [false, true]) {
				// SOF, identifier(s), control bits, DLC, data, CRC sequence: the part that is stuffed.
				const stuffed = extended
					? 1 + 11 + 1 + 1 + 18 + 1 + 1 + 1 + 4 + 8 * n + 15 // SOF ID SRR IDE ext RTR r1 r0 DLC data CRC
					: 1 + 11 + 1 + 1 + 1 + 4 + 8 * n + 15; // SOF ID RTR IDE r0 DLC data CRC
				const trailer = 1 + 1 + 1 + 7; // CRC delimiter, ACK slot, ACK delimiter, EOF
				const intermission = 3;
				expect(worstCaseFrameBits(n, extended)).toBe(
					stuffed + trailer + maxStuffOver(stuffed) + intermission
				);
			}
		}
	});

	it('the search behind that check agrees with trying every bit string up to 16 bits', () => {
		for (let length = 1; length <= 16; length++) {
			let most = 0;
			for (let pattern = 0; pattern < 2 ** length; pattern++) {
				const bits = Array.from({ length }, (_, i) => (pattern >> (length - 1 - i)) & 1);
				// Counted here one bit at a time, as referenceFrameBits counts them.
				let stuffBits = 0;
				let run = 0;
				let last = -1;
				for (const bit of bits) {
					run = bit === last ? run + 1 : 1;
					last = bit;
					if (run === 5) {
						stuffBits++;
						last = 1 - bit;
						run = 1;
					}
				}
				most = Math.max(most, stuffBits);
			}
			expect(maxStuffOver(length)).toBe(most);
		}
	});

	it('rejects lengths outside classical CAN', () => {
		expect(() => worstCaseFrameBits(9, false)).toThrow(/0–8/);
	});
});

describe('maxStuffBits (exact worst-case stuffing, compared with the Davis et al. 2007 bound)', () => {
	const davisStuff = (n: number, extended: boolean) =>
		Math.floor(((extended ? 54 : 34) + 8 * n - 1) / 4);

	it('agrees with exhaustive search: every 11-bit ID with no data (ISO 11898-1 frames via frameBits)', () => {
		let max = 0;
		for (let id = 0; id <= 0x7ff; id++)
			max = Math.max(max, frameBits(id, false, new Uint8Array(0)).stuffBits);
		expect(maxStuffBits(0, false).stuffBits).toBe(max);
	});

	it.each([0x7ff, 0x123])(
		'agrees with exhaustive search over all 2-byte payloads for ID 0x%s',
		(id) => {
			let max = 0;
			const data = new Uint8Array(2);
			for (let x = 0; x < 0x10000; x++) {
				data[0] = x >> 8;
				data[1] = x & 0xff;
				max = Math.max(max, frameBits(id, false, data).stuffBits);
			}
			const found = maxStuffBits(2, false, id);
			expect(found.stuffBits).toBe(max);
			expect(found.id).toBe(id);
		}
	);

	it.each([
		[0, false],
		[1, false],
		[8, false],
		[0, true],
		[8, true]
	] as const)(
		'%d bytes, extended %s: a witness frame reaches the exact maximum, below the bound',
		(n, extended) => {
			const found = maxStuffBits(n, extended);
			// The witness is re-checked by building its real bit stream.
			expect(frameBits(found.id, extended, found.data).stuffBits).toBe(found.stuffBits);
			expect(found.data.length).toBe(n);
			// Davis et al. 2007 bound: an upper bound, never exceeded …
			expect(found.stuffBits).toBeLessThanOrEqual(davisStuff(n, extended));
			// … and within 3 bits of the exact maximum (fixed control bits and the CRC cost 2–3 stuff bits).
			expect(davisStuff(n, extended) - found.stuffBits).toBeLessThanOrEqual(3);
			expect(
				frameBits(found.id, extended, found.data).bits + found.stuffBits + interFrameBits
			).toBeLessThanOrEqual(worstCaseFrameBits(n, extended));
		}
	);

	it('beats every random frame of the same shape', () => {
		const exact = maxStuffBits(4, false, 0x2aa).stuffBits;
		const rand = lcg(99);
		for (let t = 0; t < 2000; t++) {
			const data = Uint8Array.from({ length: 4 }, () => (rand() < 128 ? 0x0f : rand()));
			expect(frameBits(0x2aa, false, data).stuffBits).toBeLessThanOrEqual(exact);
		}
	});
});

describe('byte-wise fast path against the bit-by-bit reference', () => {
	it('frameBits equals the reference and the bit sequence on thousands of random frames, 0–8 bytes', () => {
		const rand = lcg(31337);
		for (let t = 0; t < 6000; t++) {
			const extended = t % 2 === 1;
			const n = t % 9;
			// A third of the payloads are long runs of equal bits, where stuffing is busiest.
			const data = Uint8Array.from({ length: n }, () =>
				t % 3 === 0 ? (rand() < 128 ? 0x00 : 0xff) : rand()
			);
			const id = randomId(rand, extended);
			const fast = frameBits(id, extended, data);
			expect(fast).toEqual(referenceFrameBits(id, extended, data));
			const seq = frameBitSequence(id, extended, data);
			expect(fast.stuffBits).toBe(countStuffBits(seq.bits, seq.stuffedLength));
		}
	});

	it('covers the extreme identifiers and payloads', () => {
		const ids = {
			false: [0, 1, 0x400, 0x7fe, 0x7ff],
			true: [0, 1, 0x3ffff, 0x40000, 0x1ffffffe, 0x1fffffff]
		};
		for (const extended of [false, true]) {
			for (const id of ids[`${extended}`]) {
				for (let n = 0; n <= 8; n++) {
					for (const fill of [0x00, 0xff, 0x55, 0x0f, 0xf0]) {
						const data = new Uint8Array(n).fill(fill);
						expect(frameBits(id, extended, data)).toEqual(referenceFrameBits(id, extended, data));
					}
				}
			}
		}
	});

	it('frameStuffBitsAt reads a payload by offset from a pool with the same result', () => {
		const rand = lcg(5);
		const pool = Uint8Array.from({ length: 4096 }, rand);
		for (let t = 0; t < 2000; t++) {
			const extended = t % 2 === 0;
			const n = t % 9;
			const offset = (rand() * 16 + (rand() >> 4)) % (pool.length - 8); // 0…4087, any alignment
			const id = randomId(rand, extended);
			const data = pool.slice(offset, offset + n);
			expect(frameStuffBitsAt(id, extended, pool, offset, n)).toBe(
				referenceFrameBits(id, extended, data).stuffBits
			);
		}
		expect(() => frameStuffBitsAt(0x100, false, pool, 4090, 8)).toThrow(
			/outside a pool of 4096 bytes/
		);
		expect(() => frameStuffBitsAt(0x800, false, pool, 0, 8)).toThrow(/0…0x7FF/);
		expect(() => frameStuffBitsAt(0x100, false, pool, 0, 9)).toThrow(/0–8 data bytes/);
	});

	it('the reference itself gives the hand-checked layout of a known frame', () => {
		// Cross-check of the reference against frameBitSequence's ISO 11898-1 field-order test above.
		const seq = frameBitSequence(0x123, false, Uint8Array.of(0xaa));
		const ref = referenceFrameBits(0x123, false, Uint8Array.of(0xaa));
		expect(ref.bits).toBe(44 + 8);
		expect(ref.crc).toBe(referenceCrc15(seq.bits.subarray(0, seq.stuffedLength - 15)));
		// The reference CRC meets the CRC RevEng catalogue check value of CRC-15/CAN: 0x059E for ASCII
		// "123456789", fed most significant bit first.
		const check = Array.from('123456789', (c) => c.charCodeAt(0)).flatMap((byte) =>
			[7, 6, 5, 4, 3, 2, 1, 0].map((b) => (byte >> b) & 1)
		);
		expect(referenceCrc15(check)).toBe(0x059e);
	});
});
