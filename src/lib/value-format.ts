/**
 * Printing decoded values with the precision their signal can carry, so views and exports show
 * `12.3` for a 0.1-scaled signal instead of `12.300000000000001`. A signal's physical values are
 * raw × scale + offset with a whole raw number (docs/bit-numbering.md), so every value is a
 * multiple of the scale shifted by the offset: when both have a finite decimal form, that many
 * decimals print the value exactly and nothing more. Pure: used by the browser, the server and
 * the CSV writers in `src/lib/can/capture/export.ts`.
 */

/** How to print the values of one signal. */
export type ValuePrecision =
	/** Integer signals with a terminating scale and offset: exactly this many decimals. */
	| { kind: 'decimals'; decimals: number }
	/** IEEE 754 single precision fields: the shortest text that reads back to the same float32. */
	| { kind: 'float32' }
	/** IEEE 754 double fields: 15 significant digits, all a double holds reliably (C's DBL_DIG). */
	| { kind: 'float64' }
	/** Scales or offsets without a short decimal form (1/3): the computed-value rule. */
	| { kind: 'computed' };

export interface ScaledSignal {
	scale: number;
	offset: number;
	valueType: 'unsigned' | 'signed' | 'float32' | 'float64';
}

/** Significant digits kept for computed values (means, derived channels, statistics). */
export const COMPUTED_DIGITS = 12;

/** Decimals a scale or offset may need and still count as "short"; beyond, it is treated as computed. */
const MAX_DECIMALS = 20;

/**
 * Decimal places of a number's shortest round-trip text (ECMAScript Number::toString), or null
 * when that text is not an exact short decimal — more than 15 significant digits means the double
 * only approximates the intended figure (1/3 → 0.3333333333333333).
 */
export function decimalPlaces(x: number): number | null {
	if (!Number.isFinite(x)) return null;
	const [mantissa, exponent = '0'] = String(Math.abs(x)).split('e');
	const [whole, fraction = ''] = mantissa.split('.');
	const significant = (whole + fraction).replace(/^0+/, '').replace(/0+$/, '').length;
	if (significant > 15) return null;
	const decimals = Math.max(0, fraction.length - Number(exponent));
	return decimals <= MAX_DECIMALS ? decimals : null;
}

export function precisionOf(signal: ScaledSignal): ValuePrecision {
	if (signal.valueType === 'float64') return { kind: 'float64' };
	if (signal.valueType === 'float32') return { kind: 'float32' };
	const scale = decimalPlaces(signal.scale);
	const offset = decimalPlaces(signal.offset);
	if (scale === null || offset === null) return { kind: 'computed' };
	return { kind: 'decimals', decimals: Math.max(scale, offset) };
}

/** A computed value (a mean, a derived channel, a statistic): 12 significant digits, shortest text. */
export function formatComputed(v: number): string {
	if (!Number.isFinite(v)) return String(v);
	return String(Number(v.toPrecision(COMPUTED_DIGITS)));
}

/** The shortest decimal text (at most 9 significant digits) that reads back to the same float32. */
function formatFloat32(v: number): string {
	if (!Number.isFinite(v)) return String(v);
	const target = Math.fround(v);
	for (let p = 1; p <= 9; p++) {
		const candidate = Number(v.toPrecision(p));
		if (Math.fround(candidate) === target) return String(candidate);
	}
	return String(Number(v.toPrecision(9)));
}

/**
 * One value as text. Without a precision (a channel of unknown origin) the computed-value rule
 * applies. Non-finite values print as JavaScript names them (NaN, Infinity), as a float field can
 * carry them.
 */
export function formatValue(v: number, precision?: ValuePrecision): string {
	if (!Number.isFinite(v)) return String(v);
	if (!precision || precision.kind === 'computed') return formatComputed(v);
	if (precision.kind === 'float32') return formatFloat32(v);
	if (precision.kind === 'float64') return String(Number(v.toPrecision(15)));
	const text = v.toFixed(precision.decimals);
	// -0.0 from a tiny negative rounding error reads as zero.
	return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/**
 * A mean or spread of a signal's values: two decimals more than the samples carry (a 0.1-scaled
 * signal's mean prints 34.138), or the computed-value rule when the samples have no fixed decimals.
 */
export function formatAverage(v: number, precision?: ValuePrecision): string {
	if (!Number.isFinite(v) || precision?.kind !== 'decimals') return formatComputed(v);
	return formatValue(v, {
		kind: 'decimals',
		decimals: Math.min(MAX_DECIMALS, precision.decimals + 2)
	});
}

/** A formatter for one signal, for loops over many samples. */
export function valueFormatter(precision?: ValuePrecision): (v: number) => string {
	return (v) => formatValue(v, precision);
}
