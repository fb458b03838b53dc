import { describe, expect, it } from 'vitest';
import { referenceCrc8 } from '../testing/reference-crc8';
import { seededRandom } from '../testing/seeded-random';
import { crc8, CRC8_AUTOSAR, CRC8_SAE_J1850, crc8Register, crc8Table } from './crc8';

const ascii = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0));

describe('crc8', () => {
	it('gives the CRC catalogue check values for "123456789"', () => {
		// CRC RevEng catalogue (from memory): CRC-8/SAE-J1850 width=8 poly=0x1d init=0xff refin=false
		// refout=false xorout=0xff check=0x4b; CRC-8/AUTOSAR width=8 poly=0x2f init=0xff refin=false
		// refout=false xorout=0xff check=0xdf.
		expect(crc8(ascii('123456789'), CRC8_SAE_J1850)).toBe(0x4b);
		expect(crc8(ascii('123456789'), CRC8_AUTOSAR)).toBe(0xdf);
	});

	it('the bit-by-bit reference gives the same check values (so the reference itself is right)', () => {
		// Same catalogue entries (from memory), through the slow polynomial-division reference.
		expect(referenceCrc8(ascii('123456789'), 0x1d, 0xff, 0xff)).toBe(0x4b);
		expect(referenceCrc8(ascii('123456789'), 0x2f, 0xff, 0xff)).toBe(0xdf);
	});

	it('matches the bit-by-bit reference on random messages of 0–64 bytes', () => {
		const rand = seededRandom(0xc8c8);
		for (let t = 0; t < 300; t++) {
			const message = rand.bytes(rand.int(0, 64));
			for (const p of [CRC8_SAE_J1850, CRC8_AUTOSAR]) {
				expect(crc8(message, p)).toBe(referenceCrc8(message, p.poly, p.init, p.xorout));
			}
		}
	});

	it('one table step equals eight bit steps for every register and byte', () => {
		for (const poly of [0x1d, 0x2f]) {
			const table = crc8Table(poly);
			for (let reg = 0; reg < 256; reg += 17) {
				for (let byte = 0; byte < 256; byte++) {
					const step = crc8Register(table, reg, Uint8Array.of(byte));
					expect(step).toBe(referenceCrc8([byte], poly, reg, 0));
				}
			}
		}
	});

	it('is affine: the register from r over data is the register from r over zeros XOR from 0 over data', () => {
		// Linearity of polynomial division over GF(2), which the checksum search relies on.
		const rand = seededRandom(7);
		const table = crc8Table(0x2f);
		for (let t = 0; t < 100; t++) {
			const data = rand.bytes(7);
			const r = rand.int(0, 255);
			expect(crc8Register(table, r, data)).toBe(
				crc8Register(table, r, new Uint8Array(7)) ^ referenceCrc8(data, 0x2f, 0, 0)
			);
		}
	});
});
