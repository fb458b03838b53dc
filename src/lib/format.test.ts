import { describe, expect, it } from 'vitest';
import { parseDm1 } from '$lib/can/j1939';
import { formatAddress, formatLamps, formatPgn, formatSeconds } from './format';

describe('formatLamps', () => {
	// SAE J1939-73 DM1 (from memory): byte 0 lamp status, 2 bits each — MIL bits 8–7, red stop 6–5,
	// amber warning 4–3, protect 2–1; 01 = on. Byte 1 flash codes: 11 = do not flash, 01 = fast flash.
	it.each([
		{ bytes: [0x04, 0xff], expected: 'Amber warning on' },
		{ bytes: [0x50, 0xff], expected: 'Malfunction indicator on, Red stop on' },
		{ bytes: [0x10, 0xdf], expected: 'Red stop flashing fast' },
		{ bytes: [0x00, 0xff], expected: 'none' }
	])('lamp bytes $bytes → $expected', ({ bytes, expected }) => {
		const { lamps } = parseDm1(new Uint8Array([...bytes, 0, 0, 0, 0, 0xff, 0xff]));
		expect(formatLamps(lamps)).toBe(expected);
	});
});

describe('number formats', () => {
	it('shows addresses and PGNs in decimal with hex beside (DM1 is PGN 65226 = 0xFECA, SAE J1939-73)', () => {
		expect(formatPgn(65226)).toBe('65226 (0xFECA)');
		expect(formatAddress(0)).toBe('0 (0x00)');
	});
	it('prints seconds to the microsecond without trailing zeros', () => {
		expect(formatSeconds(1.5)).toBe('1.5');
		expect(formatSeconds(0.0000014)).toBe('0.000001');
		expect(formatSeconds(2)).toBe('2');
		expect(formatSeconds(0)).toBe('0');
	});
});
