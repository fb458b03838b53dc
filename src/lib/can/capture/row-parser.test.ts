import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { parseFlag, parseHexBytes, parseTime } from './row-parser';

describe('parseTime', () => {
	// Reference: ECMAScript Number() on the same text (a general-purpose, correctly rounded decimal
	// reader), which the fast path must match bit for bit.
	it('matches Number() on random plain decimals of 1–15 digits', () => {
		const rand = seededRandom(0x71e5);
		for (let round = 0; round < 20000; round++) {
			const whole = String(rand.int(0, 10 ** rand.int(0, 9)));
			const fraction = Array.from({ length: rand.int(0, 15 - Math.min(whole.length, 15)) }, () =>
				rand.int(0, 9)
			).join('');
			const text = fraction ? `${whole}.${fraction}` : whole;
			expect(Object.is(parseTime(text), Number(text))).toBe(true);
		}
	});

	it.each([
		['0.000100', 0.0001],
		['1.', 1],
		['.5', 0.5],
		['12,25', 12.25], // decimal comma where ';' delimits
		[' 3.5 ', 3.5],
		['1e-3', 0.001],
		['-2.5', -2.5],
		['1234567890.1234567', 1234567890.1234567], // 17 digits: beyond the fast path, still exact
		['', Number.NaN],
		['1.2.3', Number.NaN],
		['abc', Number.NaN]
	])('%j reads as %d (same as Number() after trimming and comma → point)', (text, expected) => {
		expect(parseTime(text)).toBe(expected);
	});
});

describe('parseHexBytes', () => {
	const read = (text: string) => {
		const out = new Uint8Array(64);
		const n = parseHexBytes(text, out);
		return typeof n === 'string' ? n : Array.from(out.subarray(0, n));
	};

	it.each([
		['11 22 33', [0x11, 0x22, 0x33]],
		['112233', [0x11, 0x22, 0x33]],
		['1 2 a', [1, 2, 10]],
		['  Ab\tcD ', [0xab, 0xcd]],
		['', []]
	])('%j → %j', (text, bytes) => {
		expect(read(text)).toEqual(bytes);
	});

	it('explains bad payloads', () => {
		expect(read('123')).toMatch(/odd number of hex digits/);
		expect(read('12 3g')).toMatch(/not hex bytes/);
		expect(read('00'.repeat(65))).toBe('more than 64 data bytes');
	});
});

describe('parseFlag', () => {
	it.each([
		['0', false],
		['1', true],
		[' 1', true],
		['TRUE', true],
		['std', false],
		['', null],
		['2', undefined]
	])('%j → %s', (text, flag) => {
		expect(parseFlag(text)).toBe(flag);
	});
});
