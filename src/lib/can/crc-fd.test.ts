import { describe, expect, it } from 'vitest';
import { CRC17, CRC21, fdCrcFor, fdFrameCrcInit } from './crc-fd';
import { seededRandom } from './testing/seeded-random';

const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));
const bitsOf = (bytes: Uint8Array) =>
	Array.from(bytes).flatMap((byte) => [7, 6, 5, 4, 3, 2, 1, 0].map((b) => (byte >> b) & 1));

/**
 * A bit-serial register written here from the generator polynomials as ISO 11898-1:2015 lists
 * them, on '0'/'1' strings, independent of crc-fd.ts: per input bit, feedback = bit XOR the top
 * register bit; shift left; on feedback XOR in the polynomial's lower terms.
 */
function serialCrc(exponents: number[], message: number[], init: string): number {
	const width = Math.max(...exponents);
	let register = init.padStart(width, '0');
	const taps = Array.from({ length: width }, (_, i) =>
		exponents.includes(width - 1 - i) ? '1' : '0'
	).join(''); // taps[i] is the coefficient of x^(width-1-i)
	for (const bit of message) {
		const feedback = bit ^ Number(register[0]);
		register = register.slice(1) + '0';
		if (feedback)
			register = Array.from(register, (r, i) => String(Number(r) ^ Number(taps[i]))).join('');
	}
	return Number.parseInt(register, 2);
}

// ISO 11898-1:2015 generator polynomials (from memory; the same terms give the catalogue check values below).
const CRC17_TERMS = [17, 16, 14, 13, 11, 6, 4, 3, 1, 0];
const CRC21_TERMS = [21, 20, 13, 11, 7, 4, 3, 0];

describe('CRC-17 and CRC-21 (ISO 11898-1:2015 CAN FD)', () => {
	it('match the CRC catalogue check values for "123456789"', () => {
		// CRC RevEng catalogue (from memory): CRC-17/CAN-FD width=17 poly=0x1685b init=0 refin=false
		// refout=false xorout=0 check=0x04f03; CRC-21/CAN-FD width=21 poly=0x102899 init=0 check=0x0ed841.
		expect(CRC17.ofBytes(ascii('123456789'))).toBe(0x04f03);
		expect(CRC21.ofBytes(ascii('123456789'))).toBe(0x0ed841);
		// Same values over the bit sequence, fed MSB first as a controller shifts the bit stream.
		expect(CRC17.ofBits(bitsOf(ascii('123456789')))).toBe(0x04f03);
		expect(CRC21.ofBits(bitsOf(ascii('123456789')))).toBe(0x0ed841);
	});

	it('the polynomials are the ISO 11898-1:2015 terms', () => {
		const lower = (terms: number[]) =>
			terms.filter((e) => e < Math.max(...terms)).reduce((acc, e) => acc + 2 ** e, 0);
		expect(CRC17.poly).toBe(lower(CRC17_TERMS));
		expect(CRC21.poly).toBe(lower(CRC21_TERMS));
	});

	it('equal the bit-serial register of the test on random messages, init 0 and the FD frame preset', () => {
		const rand = seededRandom(1711);
		for (let t = 0; t < 300; t++) {
			const message = Array.from({ length: rand.int(0, 300) }, () => rand.int(0, 1));
			for (const [crc, terms] of [
				[CRC17, CRC17_TERMS],
				[CRC21, CRC21_TERMS]
			] as const) {
				expect(crc.ofBits(message)).toBe(serialCrc([...terms], message, '0'));
				// ISO 11898-1:2015 preset "1 0…0" (from memory): a 1 in the top register bit.
				const preset = '1'.padEnd(crc.width, '0');
				expect(crc.ofBits(message, fdFrameCrcInit(crc))).toBe(
					serialCrc([...terms], message, preset)
				);
			}
		}
	});

	it('the byte-wise table equals eight bit steps for every byte and many registers', () => {
		const rand = seededRandom(99);
		for (const crc of [CRC17, CRC21]) {
			for (let t = 0; t < 40; t++) {
				const register =
					t === 0 ? 0 : t === 1 ? 2 ** crc.width - 1 : rand.int(0, 2 ** crc.width - 1);
				for (let byte = 0; byte < 256; byte++) {
					let bitwise = register;
					for (let b = 7; b >= 0; b--) bitwise = crc.step(bitwise, (byte >> b) & 1);
					expect(crc.updateByte(register, byte)).toBe(bitwise);
				}
			}
		}
	});

	it('a message followed by its own CRC leaves a zero remainder (polynomial division)', () => {
		// Definition of a CRC without final XOR: M·x^w + CRC(M) is divisible by the generator.
		for (const crc of [CRC17, CRC21]) {
			const bits = bitsOf(ascii('123456789'));
			const value = crc.ofBits(bits);
			const tail = Array.from({ length: crc.width }, (_, i) => (value >> (crc.width - 1 - i)) & 1);
			expect(crc.ofBits([...bits, ...tail])).toBe(0);
		}
	});

	it('CRC-17 protects up to 16 data bytes, CRC-21 more (ISO 11898-1:2015)', () => {
		expect(fdCrcFor(0)).toBe(CRC17);
		expect(fdCrcFor(16)).toBe(CRC17);
		expect(fdCrcFor(20)).toBe(CRC21);
		expect(fdCrcFor(64)).toBe(CRC21);
	});
});
