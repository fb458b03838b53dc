import { describe, expect, it } from 'vitest';
import {
	decimalPlaces,
	formatAverage,
	formatComputed,
	formatValue,
	precisionOf,
	type ScaledSignal
} from './value-format';

/**
 * The exact value raw × scale + offset as a BigInt count of 10^-decimals, computed from the decimal
 * text of scale and offset with BigInt arithmetic — no floating point, so it is an independent
 * reference for what the printed digits must say.
 */
function exactUnits(raw: number, scaleText: string, offsetText: string, decimals: number): bigint {
	const parse = (text: string) => {
		const [whole, fraction = ''] = text.replace('-', '').split('.');
		const units = BigInt(whole + fraction);
		return { units: text.startsWith('-') ? -units : units, places: fraction.length };
	};
	const scale = parse(scaleText);
	const offset = parse(offsetText);
	return (
		BigInt(raw) * scale.units * 10n ** BigInt(decimals - scale.places) +
		offset.units * 10n ** BigInt(decimals - offset.places)
	);
}

/** The printed text as a BigInt count of 10^-decimals (throws if it has a different number of decimals). */
function printedUnits(text: string, decimals: number): bigint {
	const [whole, fraction = ''] = text.replace('-', '').split('.');
	expect(fraction.length).toBe(decimals);
	const units = BigInt(whole + fraction);
	return text.startsWith('-') ? -units : units;
}

const signal = (scale: number, offset = 0, valueType: ScaledSignal['valueType'] = 'unsigned') => ({
	scale,
	offset,
	valueType
});

describe('precisionOf and formatValue, one case per kind of scale', () => {
	// Expected decimals follow from arithmetic: 10^-n has n decimals; 2^-n = 5^n / 10^n has exactly n;
	// an offset adds its own decimals. The value checks compare against exact BigInt arithmetic.
	it.each([
		['unit scale', '1', '0', 0, [0, 1, 255, 65535]],
		['whole scale above one', '10', '0', 0, [0, 3, 250]],
		['tenths (a 0.1-scaled signal prints one decimal)', '0.1', '0', 1, [0, 1, 123, 998, 65535]],
		['hundredths', '0.01', '0', 2, [0, 7, 3524, 9980]],
		['millionths (the 0.0035240000000000002 case)', '0.000001', '0', 6, [3524, 1, 999999]],
		[
			'eighths, SAE J1939-71 engine speed 0.125 rpm/bit (from memory)',
			'0.125',
			'0',
			3,
			[0, 1, 6000]
		],
		['a half', '0.5', '0', 1, [0, 1, 3, 255]],
		['2^-10 (binary fraction)', '0.0009765625', '0', 10, [1, 1023, 4096]],
		['a twentieth', '0.05', '0', 2, [0, 1, 7, 1999]],
		[
			'J1939 coolant: 1 °C/bit, offset −40 (SAE J1939-71, from memory)',
			'1',
			'-40',
			0,
			[0, 40, 255]
		],
		['kelvin offset −273.15 with a whole scale', '1', '-273.15', 2, [0, 273, 300]],
		['0.1 scale with a 0.05 offset', '0.1', '0.05', 2, [0, 1, 19]],
		['negative scale', '-0.1', '0', 1, [0, 1, 55]]
	])('%s → %i decimals, digits exact', (_kind, scaleText, offsetText, decimals, raws) => {
		const s = signal(Number(scaleText), Number(offsetText));
		const precision = precisionOf(s);
		expect(precision).toEqual({ kind: 'decimals', decimals });
		for (const raw of raws) {
			const v = raw * s.scale + s.offset; // the decoder's own float arithmetic
			const text = formatValue(v, precision);
			expect(printedUnits(text, decimals)).toBe(exactUnits(raw, scaleText, offsetText, decimals));
		}
	});

	it('signed raw values print their sign', () => {
		const p = precisionOf(signal(0.1, 0, 'signed'));
		expect(formatValue(-1234 * 0.1, p)).toBe('-123.4');
		expect(formatValue(-0.0000001, p)).toBe('0.0'); // a rounding residue never prints as -0.0
	});

	it('a scale without a short decimal form (1/3) falls back to 12 significant digits', () => {
		const p = precisionOf(signal(1 / 3));
		expect(p).toEqual({ kind: 'computed' });
		// 5/3 = 1.666…: twelve significant digits, rounded half up in the last place.
		expect(formatValue(5 * (1 / 3), p)).toBe('1.66666666667');
	});

	it('float32 fields print the shortest text that reads back to the same float32 (IEEE 754 via DataView)', () => {
		const p = precisionOf(signal(1, 0, 'float32'));
		expect(p).toEqual({ kind: 'float32' });
		const view = new DataView(new ArrayBuffer(4));
		for (const [written, shortest] of [
			[0.1, '0.1'],
			[99.8, '99.8'],
			[-2.5, '-2.5'],
			[3.4028234663852886e38, '3.4028235e+38'] // FLT_MAX, IEEE 754 binary32 (from memory)
		] as const) {
			view.setFloat32(0, written, true);
			const decoded = view.getFloat32(0, true); // what the decoder reads: 0.10000000149011612 for 0.1
			const text = formatValue(decoded, p);
			expect(text).toBe(shortest);
			expect(Math.fround(Number(text))).toBe(decoded);
		}
	});

	it('float64 fields keep 15 significant digits (C float.h DBL_DIG = 15, from memory)', () => {
		const p = precisionOf(signal(0.1, 0, 'float64'));
		expect(p).toEqual({ kind: 'float64' });
		const view = new DataView(new ArrayBuffer(8));
		view.setFloat64(0, 998.0000000001, true);
		expect(formatValue(view.getFloat64(0, true) * 0.1, p)).toBe('99.80000000001');
		expect(formatValue(998 * 0.1, p)).toBe('99.8'); // 99.80000000000001 without the rule
	});

	it('non-finite values print as they are', () => {
		expect(formatValue(NaN, { kind: 'float32' })).toBe('NaN');
		expect(formatValue(-Infinity, { kind: 'decimals', decimals: 1 })).toBe('-Infinity');
	});
});

describe('decimalPlaces', () => {
	it.each([
		[1, 0],
		[250, 0],
		[0.1, 1],
		[0.125, 3],
		[1e-7, 7], // printed as 1e-7 by Number::toString
		[1.25e-7, 9],
		[-273.15, 2]
	])('%d has %i decimals', (x, d) => {
		expect(decimalPlaces(x)).toBe(d);
	});

	it('refuses numbers without a short decimal form', () => {
		expect(decimalPlaces(1 / 3)).toBeNull();
		expect(decimalPlaces(Math.PI)).toBeNull();
		expect(decimalPlaces(NaN)).toBeNull();
	});
});

describe('formatAverage', () => {
	it('gives a mean two decimals more than its samples carry', () => {
		// (341 + 342 + 341) / 3 tenths = 34.1333…: the samples have one decimal, the mean three.
		expect(formatAverage((34.1 + 34.2 + 34.1) / 3, { kind: 'decimals', decimals: 1 })).toBe(
			'34.133'
		);
		expect(formatAverage(6106.6135, { kind: 'decimals', decimals: 0 })).toBe('6106.61');
		expect(formatAverage(1 / 3, { kind: 'float32' })).toBe('0.333333333333');
	});
});

describe('formatComputed', () => {
	it('drops binary noise from arithmetic (0.1 + 0.2, 998 × 0.1)', () => {
		expect(formatComputed(0.1 + 0.2)).toBe('0.3');
		expect(formatComputed(998 * 0.1)).toBe('99.8');
		expect(formatComputed(3524 * 0.000001)).toBe('0.003524');
	});
});
