import { describe, expect, it } from 'vitest';
import { dlcToLength, lengthToDlc } from './dlc';

describe('dlcToLength', () => {
	// ISO 11898-1 (CAN FD): DLC 0–8 are byte counts; 9–15 code 12, 16, 20, 24, 32, 48, 64 bytes.
	it.each([
		[0, 0],
		[1, 1],
		[7, 7],
		[8, 8],
		[9, 12],
		[10, 16],
		[11, 20],
		[12, 24],
		[13, 32],
		[14, 48],
		[15, 64]
	])('DLC %i → %i bytes (ISO 11898-1)', (dlc, bytes) => {
		expect(dlcToLength(dlc)).toBe(bytes);
	});

	it.each([-1, 16, 2.5, Number.NaN])('rejects DLC %s', (dlc) => {
		expect(() => dlcToLength(dlc)).toThrow(/DLC must be/);
	});
});

describe('lengthToDlc', () => {
	// ISO 11898-1: an FD payload is padded up to the next codable length.
	it.each([
		[0, 0],
		[8, 8],
		[9, 9],
		[12, 9],
		[13, 10],
		[16, 10],
		[17, 11],
		[20, 11],
		[21, 12],
		[24, 12],
		[25, 13],
		[32, 13],
		[33, 14],
		[48, 14],
		[49, 15],
		[64, 15]
	])('%i bytes → DLC %i (ISO 11898-1)', (bytes, dlc) => {
		expect(lengthToDlc(bytes)).toBe(dlc);
	});

	it('is the inverse of dlcToLength on every code', () => {
		for (let dlc = 0; dlc <= 15; dlc++) expect(lengthToDlc(dlcToLength(dlc))).toBe(dlc);
	});

	it.each([-1, 65, 1.5])('rejects length %s', (len) => {
		expect(() => lengthToDlc(len)).toThrow(/payload length/);
	});
});
