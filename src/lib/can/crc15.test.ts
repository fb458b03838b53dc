import { describe, expect, it } from 'vitest';
import { crc15, crc15Bytes, crc15Step, crc15UpdateByte } from './crc15';

const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));
const bitsOf = (bytes: Uint8Array) =>
	Array.from(bytes).flatMap((byte) => [7, 6, 5, 4, 3, 2, 1, 0].map((b) => (byte >> b) & 1));

describe('crc15 (ISO 11898-1 CRC-15, polynomial 0x4599)', () => {
	it('matches the catalogue check value over bytes', () => {
		// CRC RevEng catalogue, CRC-15/CAN: width=15 poly=0x4599 init=0 refin=false refout=false
		// xorout=0 check=0x059e (CRC of ASCII "123456789").
		expect(crc15Bytes(ascii('123456789'))).toBe(0x059e);
	});

	it('gives the same result over the equivalent bit sequence', () => {
		// Same catalogue check value, fed MSB first as a CAN controller shifts the bit stream.
		expect(crc15(bitsOf(ascii('123456789')))).toBe(0x059e);
	});

	it('is linear with zero init: CRC(a ⊕ b) = CRC(a) ⊕ CRC(b) for equal lengths', () => {
		// Property of any CRC with init 0 and xorout 0 (polynomial division over GF(2)).
		let seed = 12345;
		const rand = () => ((seed = (seed * 1103515245 + 12345) >>> 0) >>> 24) & 0xff;
		for (let t = 0; t < 50; t++) {
			const a = Uint8Array.from({ length: 9 }, rand);
			const b = Uint8Array.from({ length: 9 }, rand);
			const x = a.map((v, i) => v ^ b[i]);
			expect(crc15Bytes(x)).toBe(crc15Bytes(a) ^ crc15Bytes(b));
		}
	});

	it('a message followed by its own CRC leaves a zero remainder (polynomial division)', () => {
		// Definition of a CRC without final XOR: M·x^15 + CRC(M) is divisible by the generator.
		const bits = bitsOf(ascii('123456789'));
		const crc = crc15(bits);
		const withCrc = [...bits, ...Array.from({ length: 15 }, (_, i) => (crc >> (14 - i)) & 1)];
		expect(crc15(withCrc)).toBe(0);
	});

	it('the byte-wise table step equals eight bit steps, for every byte and many registers', () => {
		// The ISO 11898-1 shift register (crc15Step) is the reference for the table-driven path.
		let seed = 777;
		const rand = () => (seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) >>> 17; // 15 bits
		for (let t = 0; t < 64; t++) {
			const register = t === 0 ? 0 : t === 1 ? 0x7fff : rand();
			for (let byte = 0; byte < 256; byte++) {
				let bitwise = register;
				for (let b = 7; b >= 0; b--) bitwise = crc15Step(bitwise, (byte >> b) & 1);
				expect(crc15UpdateByte(register, byte)).toBe(bitwise);
			}
		}
	});
});
