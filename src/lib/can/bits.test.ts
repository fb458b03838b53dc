import { describe, expect, it } from 'vitest';
import {
	extractRaw,
	fieldBitPositions,
	fieldFits,
	fieldLayout,
	insertRaw,
	readFloatNumber,
	readIntegerNumber
} from './bits';
import { referenceExtract, referencePositions } from './testing/reference-bits';
import { seededRandom } from './testing/seeded-random';

/** A random field that fits a 64-byte payload. */
function randomField(rand: ReturnType<typeof seededRandom>, payload = 64) {
	const order = rand.pick(['little', 'big'] as const);
	const length = rand.int(1, 64);
	for (;;) {
		const startBit = rand.int(0, payload * 8 - 1);
		if (fieldFits(fieldLayout(startBit, length, order), payload))
			return { startBit, length, order };
	}
}

describe('byte-aligned fields read exactly as DataView reads them', () => {
	// General-purpose reference: DataView getUint8/16/32, getBigUint64, getInt8/16/32, getBigInt64,
	// getFloat32/64 with littleEndian true/false (ECMAScript spec; IEEE 754 for the floats).
	const rand = seededRandom(0x5eed01);
	const orders = [
		['little', true],
		['big', false]
	] as const;

	it.each([1, 2, 4, 8])('%i-byte fields, both orders, random payloads and offsets', (bytes) => {
		for (let round = 0; round < 400; round++) {
			const data = rand.bytes(64);
			const view = new DataView(data.buffer);
			const k = rand.int(0, 64 - bytes);
			for (const [order, littleEndian] of orders) {
				// docs/bit-numbering.md: a big-endian field filling bytes k…k+m−1 has startBit = 8·(k+m−1)
				const startBit = order === 'little' ? 8 * k : 8 * (k + bytes - 1);
				const layout = fieldLayout(startBit, bytes * 8, order);
				const unsigned = extractRaw(data, startBit, bytes * 8, order);
				const signedNumber = readIntegerNumber(data, 0, layout, true);
				const unsignedNumber = readIntegerNumber(data, 0, layout, false);
				if (bytes === 1) {
					expect(unsigned).toBe(BigInt(view.getUint8(k)));
					expect(signedNumber).toBe(view.getInt8(k));
				} else if (bytes === 2) {
					expect(unsigned).toBe(BigInt(view.getUint16(k, littleEndian)));
					expect(signedNumber).toBe(view.getInt16(k, littleEndian));
					expect(unsignedNumber).toBe(view.getUint16(k, littleEndian));
				} else if (bytes === 4) {
					expect(unsigned).toBe(BigInt(view.getUint32(k, littleEndian)));
					expect(signedNumber).toBe(view.getInt32(k, littleEndian));
					expect(unsignedNumber).toBe(view.getUint32(k, littleEndian));
					expect(readFloatNumber(data, 0, layout)).toBe(view.getFloat32(k, littleEndian));
				} else {
					expect(unsigned).toBe(view.getBigUint64(k, littleEndian));
					// Number(BigInt) is the correctly rounded double; the 2-part read must agree.
					expect(unsignedNumber).toBe(Number(view.getBigUint64(k, littleEndian)));
					expect(signedNumber).toBe(Number(view.getBigInt64(k, littleEndian)));
					expect(readFloatNumber(data, 0, layout)).toBe(view.getFloat64(k, littleEndian));
				}
			}
		}
	});

	it('reads floats at a base offset inside a larger buffer', () => {
		const data = rand.bytes(80);
		const view = new DataView(data.buffer);
		const base = 13;
		// DataView reference: IEEE 754 binary64 big-endian at byte base + 2.
		expect(readFloatNumber(data, base, fieldLayout(8 * 9, 64, 'big'))).toBe(
			view.getFloat64(base + 2, false)
		);
	});
});

describe('unaligned fields against the slow reference', () => {
	const rand = seededRandom(0x5eed02);

	it('extractRaw and readIntegerNumber match the bit-by-bit reference (docs/bit-numbering.md)', () => {
		for (let round = 0; round < 3000; round++) {
			const { startBit, length, order } = randomField(rand);
			const data = rand.bytes(64);
			const expected = referenceExtract(data, startBit, length, order);
			expect(extractRaw(data, startBit, length, order)).toBe(expected);
			const layout = fieldLayout(startBit, length, order);
			expect(readIntegerNumber(data, 0, layout, false)).toBe(Number(expected));
			expect(readIntegerNumber(data, 0, layout, true)).toBe(
				Number(BigInt.asIntN(length, expected))
			);
		}
	});

	it('fieldBitPositions matches the reference walk', () => {
		for (let round = 0; round < 500; round++) {
			const { startBit, length, order } = randomField(rand);
			expect(fieldBitPositions(startBit, length, order)).toEqual(
				referencePositions(startBit, length, order)
			);
		}
	});

	it('insertRaw writes only the field bits, and extractRaw reads back what was written', () => {
		for (let round = 0; round < 2000; round++) {
			const { startBit, length, order } = randomField(rand);
			const data = rand.bytes(64);
			const before = data.slice();
			const raw = extractRaw(rand.bytes(64), 0, length, 'little'); // any random length-bit value
			insertRaw(data, startBit, length, order, raw);
			expect(extractRaw(data, startBit, length, order)).toBe(raw);
			// reference: set each field bit from the value bit by bit; every other bit stays as before
			const expected = before.slice();
			referencePositions(startBit, length, order).forEach((p, i) => {
				const bit = Number((raw >> BigInt(i)) & 1n);
				expected[p >> 3] = (expected[p >> 3] & ~(1 << (p & 7))) | (bit << (p & 7));
			});
			expect(data).toEqual(expected);
		}
	});
});

describe('big-endian layout (docs/bit-numbering.md)', () => {
	it('a field filling bytes k…k+m−1 has startBit 8·(k+m−1)', () => {
		// Hand-worked from docs/bit-numbering.md: bytes 2,3 = 12 34 hold 0x1234 big-endian; LSB is bit 0 of byte 3.
		const data = Uint8Array.from([0, 0, 0x12, 0x34, 0, 0, 0, 0]);
		expect(extractRaw(data, 24, 16, 'big')).toBe(0x1234n);
		expect(fieldBitPositions(24, 16, 'big')).toEqual([
			24, 25, 26, 27, 28, 29, 30, 31, 16, 17, 18, 19, 20, 21, 22, 23
		]);
		expect(fieldLayout(24, 16, 'big')).toMatchObject({ lowByte: 2, highByte: 3 });
	});

	it('a 12-bit big-endian field starting mid-byte continues in the previous byte', () => {
		// bits 4–7 of byte 1 are value bits 0–3, bits 0–7 of byte 0 are value bits 4–11.
		const data = Uint8Array.from([0xab, 0xc0]);
		expect(extractRaw(data, 12, 12, 'big')).toBe(0xabcn);
	});
});

describe('bounds', () => {
	it('rejects fields beyond the payload with the bytes needed', () => {
		expect(() => extractRaw(new Uint8Array(8), 60, 8, 'little')).toThrow(/bytes 7…8 .* 8 byte/);
		expect(() => extractRaw(new Uint8Array(8), 4, 8, 'big')).toThrow(/bytes -1…0/);
		expect(() => insertRaw(new Uint8Array(2), 8, 16, 'little', 1n)).toThrow(RangeError);
	});

	it('rejects raw values that would be truncated', () => {
		expect(() => insertRaw(new Uint8Array(8), 0, 8, 'little', 256n)).toThrow(
			/does not fit in 8 bits/
		);
		expect(() => insertRaw(new Uint8Array(8), 0, 8, 'little', -129n)).toThrow(/does not fit/);
		const data = new Uint8Array(1);
		insertRaw(data, 0, 8, 'little', -1n); // two's complement reading accepted
		expect(data[0]).toBe(0xff);
	});

	it('rejects bad lengths', () => {
		expect(() => fieldLayout(0, 0, 'little')).toThrow(/1–64/);
		expect(() => fieldLayout(0, 65, 'big')).toThrow(/1–64/);
	});
});
