import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { bucketOf, decimateMinMax, lowerBound, upperBound } from './decimate';

/** A random walk with sorted, irregular times, some repeated times and some NaN gaps. */
function randomSeries(seed: number, n: number) {
	const rnd = seededRandom(seed);
	const time = new Float64Array(n);
	const value = new Float64Array(n);
	let t = rnd.next();
	let v = 0;
	for (let i = 0; i < n; i++) {
		if (rnd.next() > 0.05) t += rnd.next() * 0.02; // ~5 % of samples share the previous time
		v += rnd.next() - 0.5;
		time[i] = t;
		value[i] = rnd.next() < 0.02 ? NaN : v;
	}
	return { time, value };
}

/** Brute force: every sample in [from, to] checked one by one, slice by slice. */
function linearScan(
	time: Float64Array,
	value: Float64Array,
	from: number,
	to: number,
	buckets: number
) {
	const slices = new Map<number, { min: number; max: number }>();
	for (let i = 0; i < time.length; i++) {
		if (time[i] < from || time[i] > to || Number.isNaN(value[i])) continue;
		const k = bucketOf(time[i], from, to, buckets);
		const s = slices.get(k) ?? { min: Infinity, max: -Infinity };
		s.min = Math.min(s.min, value[i]);
		s.max = Math.max(s.max, value[i]);
		slices.set(k, s);
	}
	return slices;
}

describe('binary search bounds', () => {
	it('match a linear scan on a series with repeated times', () => {
		const time = Float64Array.from([0, 1, 1, 1, 2, 3, 3, 5]);
		for (const t of [-1, 0, 0.5, 1, 2, 3, 4, 5, 6]) {
			expect(lowerBound(time, t)).toBe(
				time.findIndex((x) => x >= t) === -1 ? time.length : time.findIndex((x) => x >= t)
			);
			expect(upperBound(time, t)).toBe(
				time.findIndex((x) => x > t) === -1 ? time.length : time.findIndex((x) => x > t)
			);
		}
	});
});

describe('decimateMinMax', () => {
	it.each([1, 2, 3, 4, 5])(
		'keeps every slice’s true min and max on random series (seed %i)',
		(seed) => {
			const { time, value } = randomSeries(seed, 20_000);
			const rnd = seededRandom(seed * 7919);
			const span = time[time.length - 1] - time[0];
			const from = time[0] + rnd.next() * span * 0.3;
			const to = from + span * (0.2 + rnd.next() * 0.5);
			const buckets = rnd.int(50, 800);
			const d = decimateMinMax(time, value, from, to, buckets);
			expect(d.raw).toBe(false);

			const expected = linearScan(time, value, from, to, buckets);
			const inside = [...d.time.keys()].filter((j) => d.time[j] >= from && d.time[j] <= to);
			const got = new Map<number, number[]>();
			for (const j of inside) {
				const k = bucketOf(d.time[j], from, to, buckets);
				got.set(k, [...(got.get(k) ?? []), d.value[j]]);
			}
			expect([...got.keys()].sort((a, b) => a - b)).toEqual(
				[...expected.keys()].sort((a, b) => a - b)
			);
			for (const [k, s] of expected) {
				const values = got.get(k)!;
				expect(values.length).toBeLessThanOrEqual(2);
				expect(Math.min(...values)).toBe(s.min);
				expect(Math.max(...values)).toBe(s.max);
			}
			// Each point is a real sample, in time order.
			for (let j = 1; j < d.time.length; j++)
				expect(d.time[j]).toBeGreaterThanOrEqual(d.time[j - 1]);
			expect(d.inRange).toBe(time.filter((t) => t >= from && t <= to).length);
		}
	);

	it('keeps a one-sample spike among a million flat samples', () => {
		const n = 1_000_000;
		const time = Float64Array.from({ length: n }, (_, i) => i * 1e-3);
		const value = new Float64Array(n).fill(20);
		value[654_321] = 250;
		value[123_456] = -5;
		const d = decimateMinMax(time, value, 0, time[n - 1], 1000);
		expect(d.time.length).toBeLessThanOrEqual(2000);
		expect(Math.max(...d.value)).toBe(250);
		expect(Math.min(...d.value)).toBe(-5);
		expect(d.time[d.value.indexOf(250)]).toBe(time[654_321]);
	});

	it('returns the samples as they are (NaN skipped) when fewer than 2 × buckets lie in the range, with one neighbour each side', () => {
		const time = Float64Array.from([0, 1, 2, 3, 4, 5, 6]);
		const value = Float64Array.from([10, 11, NaN, 13, 14, 15, 16]);
		const d = decimateMinMax(time, value, 1.5, 4.5, 10);
		expect(d.raw).toBe(true);
		expect(d.inRange).toBe(3);
		expect([...d.time]).toEqual([1, 3, 4, 5]);
		expect([...d.value]).toEqual([11, 13, 14, 15]);
		expect(d.leadingEdge && d.trailingEdge).toBe(true);
	});

	it('gives an empty range its neighbours only, and an empty series nothing', () => {
		const time = Float64Array.from([0, 10]);
		const value = Float64Array.from([1, 2]);
		expect([...decimateMinMax(time, value, 4, 6, 100).value]).toEqual([1, 2]);
		const none = decimateMinMax(new Float64Array(0), new Float64Array(0), 0, 1, 10);
		expect(none.time.length + none.inRange).toBe(0);
	});

	it('refuses a reversed range, a non-whole bucket count and mismatched arrays', () => {
		const t = Float64Array.from([0, 1]);
		expect(() => decimateMinMax(t, t, 2, 1, 10)).toThrow(/from ≤ to/);
		expect(() => decimateMinMax(t, t, 0, 1, 0)).toThrow(/buckets/);
		expect(() => decimateMinMax(t, t, 0, 1, 2.5)).toThrow(/buckets/);
		expect(() => decimateMinMax(t, new Float64Array(3), 0, 1, 2)).toThrow(/same length/);
	});
});
