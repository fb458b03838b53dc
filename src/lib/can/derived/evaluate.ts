/**
 * Derived channels, part 2: evaluating a parsed formula (formula.ts) over decoded channels on a
 * common time base (docs/derived-channels.md). The base is every time at which any channel the
 * formula reads has a sample, from the moment all of them have one; between its own samples a
 * channel holds its latest value, as a receiving device would. Series functions (avg, ddt,
 * integral) work on that base. Samples whose result is not a finite number are left out.
 */
import { parseFormula, type Expr, type FormulaChannel, type FormulaProblem } from './formula';

/** What evaluation needs of a channel (a decoded `Channel` fits): times non-decreasing. */
export interface SampledChannel {
	time: ArrayLike<number>;
	value: ArrayLike<number>;
}

export interface DerivedSeries {
	time: Float64Array;
	value: Float64Array;
}

/** The sorted, de-duplicated union of the inputs' times from the latest first sample on. */
export function commonTimeBase(inputs: readonly SampledChannel[]): Float64Array {
	if (inputs.length === 0 || inputs.some((c) => c.time.length === 0)) return new Float64Array(0);
	const start = Math.max(...inputs.map((c) => c.time[0]));
	// Counted first, then filled: one typed array of the times, no growing list (a long capture's
	// channels have millions of samples).
	let total = 0;
	for (const c of inputs) for (let i = 0; i < c.time.length; i++) if (c.time[i] >= start) total++;
	const sorted = new Float64Array(total);
	let at = 0;
	for (const c of inputs)
		for (let i = 0; i < c.time.length; i++) if (c.time[i] >= start) sorted[at++] = c.time[i];
	sorted.sort();
	let n = 0;
	for (let i = 0; i < sorted.length; i++)
		if (i === 0 || sorted[i] !== sorted[n - 1]) sorted[n++] = sorted[i];
	return sorted.slice(0, n);
}

/** A channel's latest value at or before each base time (zero-order hold). */
export function holdOnto(channel: SampledChannel, base: Float64Array): Float64Array {
	const out = new Float64Array(base.length);
	let j = -1;
	for (let i = 0; i < base.length; i++) {
		while (j + 1 < channel.time.length && channel.time[j + 1] <= base[i]) j++;
		out[i] = j >= 0 ? channel.value[j] : NaN;
	}
	return out;
}

type Value = number | Float64Array;

function map1(a: Value, f: (x: number) => number): Value {
	return typeof a === 'number' ? f(a) : a.map(f);
}

function map2(a: Value, b: Value, f: (x: number, y: number) => number): Value {
	if (typeof a === 'number' && typeof b === 'number') return f(a, b);
	const n = typeof a === 'number' ? (b as Float64Array).length : a.length;
	const out = new Float64Array(n);
	for (let i = 0; i < n; i++)
		out[i] = f(typeof a === 'number' ? a : a[i], typeof b === 'number' ? b : b[i]);
	return out;
}

/** NaN (absent) in, NaN out; otherwise 1 for true and 0 for false. */
const truth = (f: (x: number, y: number) => boolean) => (x: number, y: number) =>
	x !== x || y !== y ? NaN : f(x, y) ? 1 : 0;

const BINARY: Record<string, (x: number, y: number) => number> = {
	'+': (x, y) => x + y,
	'-': (x, y) => x - y,
	'*': (x, y) => x * y,
	'/': (x, y) => x / y,
	'^': (x, y) => x ** y,
	// Remainder with the sign of the divisor, as mathjs's `mod` defines it.
	mod: (x, y) => x - y * Math.floor(x / y),
	'<': truth((x, y) => x < y),
	'<=': truth((x, y) => x <= y),
	'>': truth((x, y) => x > y),
	'>=': truth((x, y) => x >= y),
	'==': truth((x, y) => x === y),
	'!=': truth((x, y) => x !== y),
	and: truth((x, y) => x !== 0 && y !== 0),
	or: truth((x, y) => x !== 0 || y !== 0)
};

const asSeries = (v: Value, n: number) => (typeof v === 'number' ? new Float64Array(n).fill(v) : v);

/** Mean of the finite samples in the trailing window (t − seconds, t] at each base time. */
export function movingAverage(base: Float64Array, x: Float64Array, seconds: number): Float64Array {
	const out = new Float64Array(base.length);
	let sum = 0;
	let count = 0;
	let start = 0;
	for (let i = 0; i < base.length; i++) {
		if (Number.isFinite(x[i])) {
			sum += x[i];
			count++;
		}
		while (base[start] <= base[i] - seconds) {
			if (Number.isFinite(x[start])) {
				sum -= x[start];
				count--;
			}
			start++;
		}
		out[i] = count ? sum / count : NaN;
	}
	return out;
}

/** Backward difference per second; the first sample has none. */
export function derivative(base: Float64Array, x: Float64Array): Float64Array {
	const out = new Float64Array(base.length);
	out[0] = NaN;
	for (let i = 1; i < base.length; i++) out[i] = (x[i] - x[i - 1]) / (base[i] - base[i - 1]);
	return out;
}

/** Running trapezoid-rule area from the first sample (0 there); steps touching an absent value add nothing. */
export function runningIntegral(base: Float64Array, x: Float64Array): Float64Array {
	const out = new Float64Array(base.length);
	let area = 0;
	for (let i = 1; i < base.length; i++) {
		const step = ((x[i] + x[i - 1]) / 2) * (base[i] - base[i - 1]);
		if (Number.isFinite(step)) area += step;
		out[i] = area;
	}
	return out;
}

function run(expr: Expr, base: Float64Array, held: Map<number, Float64Array>): Value {
	const n = base.length;
	const r = (e: Expr) => run(e, base, held);
	switch (expr.kind) {
		case 'number':
			return expr.value;
		case 'channel':
			return held.get(expr.index)!;
		case 'neg':
			return map1(r(expr.arg), (x) => -x);
		case 'not':
			return map1(r(expr.arg), (x) => (x !== x ? NaN : x === 0 ? 1 : 0));
		case 'abs':
			return map1(r(expr.arg), Math.abs);
		case 'binary':
			return map2(r(expr.left), r(expr.right), BINARY[expr.op]);
		case 'if': {
			const c = r(expr.condition);
			const t = r(expr.then);
			const f = r(expr.else);
			const pick = (ci: number, ti: number, fi: number) => (ci !== ci ? NaN : ci !== 0 ? ti : fi);
			if (typeof c === 'number' && typeof t === 'number' && typeof f === 'number')
				return pick(c, t, f);
			const cs = asSeries(c, n);
			const ts = asSeries(t, n);
			const fs = asSeries(f, n);
			return cs.map((ci, i) => pick(ci, ts[i], fs[i]));
		}
		case 'minmax': {
			// Math.min/max give NaN when any argument is NaN: an absent input stays absent.
			const pick = expr.fn === 'min' ? Math.min : Math.max;
			return expr.args.map(r).reduce((a, b) => map2(a, b, pick));
		}
		case 'avg':
			return movingAverage(base, asSeries(r(expr.arg), n), expr.seconds);
		case 'ddt':
			return derivative(base, asSeries(r(expr.arg), n));
		case 'integral':
			return runningIntegral(base, asSeries(r(expr.arg), n));
	}
}

/** Evaluates a parsed formula; `channels` gives the samples of every index in `inputs`. */
export function evaluateExpr(
	expr: Expr,
	inputs: readonly number[],
	channels: (index: number) => SampledChannel
): DerivedSeries {
	const sources = inputs.map(channels);
	const base = commonTimeBase(sources);
	const held = new Map(inputs.map((index, k) => [index, holdOnto(sources[k], base)]));
	const result = asSeries(run(expr, base, held), base.length);
	let kept = 0;
	for (let i = 0; i < base.length; i++) if (Number.isFinite(result[i])) kept++;
	const time = new Float64Array(kept);
	const value = new Float64Array(kept);
	for (let i = 0, k = 0; i < base.length; i++) {
		if (!Number.isFinite(result[i])) continue;
		time[k] = base[i];
		value[k++] = result[i];
	}
	return { time, value };
}

export type DerivedResult =
	{ ok: true; series: DerivedSeries; inputs: number[] } | { ok: false; problem: FormulaProblem };

/** Parses and evaluates in one step, for callers holding decoded channels with their names. */
export function evaluateFormula(
	text: string,
	channels: readonly (FormulaChannel & SampledChannel)[]
): DerivedResult {
	const parsed = parseFormula(text, channels);
	if (!parsed.ok) return parsed;
	const byIndex = new Map(channels.map((c) => [c.index, c]));
	return {
		ok: true,
		series: evaluateExpr(parsed.expr, parsed.inputs, (i) => byIndex.get(i)!),
		inputs: parsed.inputs
	};
}
