import { Buffer } from 'node:buffer';
import { describe, expect, it } from 'vitest';
import { seededRandom } from '$lib/can/testing/seeded-random';
import { fitPayload, formatHexBytes, parseHexBytes } from './hex-input';

describe('parseHexBytes', () => {
	it.each(['12 34 ab', '1234AB', '0x12,0x34,0xab', '12:34:AB', '12-34-ab', ' 12\t34\nAB '])(
		'reads %j as 12 34 AB',
		(text) => {
			expect(parseHexBytes(text)).toEqual({ ok: true, bytes: Uint8Array.from([0x12, 0x34, 0xab]) });
		}
	);

	it('agrees with Node’s Buffer.from(hex) (a general-purpose reference) on random payloads', () => {
		const random = seededRandom(11);
		for (let n = 0; n < 200; n++) {
			const bytes = random.bytes(random.int(0, 64));
			const hex = Buffer.from(bytes).toString('hex');
			const parsed = parseHexBytes(hex);
			expect(parsed.ok && Buffer.from(parsed.bytes).equals(Buffer.from(hex, 'hex'))).toBe(true);
		}
	});

	it('accepts single digits as one byte each when spaced', () => {
		expect(parseHexBytes('0 1 f')).toEqual({ ok: true, bytes: Uint8Array.from([0, 1, 15]) });
	});

	it('reads an empty box as no bytes', () => {
		expect(parseHexBytes('   ')).toEqual({ ok: true, bytes: new Uint8Array(0) });
	});

	it.each([
		['12 G4', /"G4" is not hex/],
		['123', /odd number of hex digits/],
		['00'.repeat(65), /more than a CAN payload can carry \(at most 64\)/]
	])('explains what is wrong with %j', (text, message) => {
		const result = parseHexBytes(text);
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.message).toMatch(message);
	});
});

describe('formatHexBytes', () => {
	it('writes two upper-case digits a byte, spaced, like Buffer’s hex with spaces', () => {
		const bytes = Uint8Array.from([0, 0x0a, 0xff, 0x3c]);
		expect(formatHexBytes(bytes)).toBe('00 0A FF 3C');
		expect(formatHexBytes(bytes).replaceAll(' ', '').toLowerCase()).toBe(
			Buffer.from(bytes).toString('hex')
		);
	});
});

describe('fitPayload', () => {
	it('pads short payloads with zero bytes and drops extra ones', () => {
		expect(fitPayload(Uint8Array.from([1, 2]), 4)).toEqual(Uint8Array.from([1, 2, 0, 0]));
		expect(fitPayload(Uint8Array.from([1, 2, 3]), 2)).toEqual(Uint8Array.from([1, 2]));
	});
});
