import { max, mean, min, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { histogram, spanStatistics, xyPairs } from './span';

const { next: random } = seededRandom(15);
const times = Array.from({ length: 400 }, (_, i) => i * 0.01 + random() * 0.004);
const values = times.map(() => Math.round((random() * 200 - 50) * 10) / 10);
const channel = { time: Float64Array.from(times), value: Float64Array.from(values) };

describe('spanStatistics', () => {
	it('matches simple-statistics over the samples inside the span', () => {
		const from = 0.5;
		const to = 2.75;
		const inside = values.filter((_, i) => times[i] >= from && times[i] <= to);
		const s = spanStatistics(channel, from, to);
		// Reference: simple-statistics, a general-purpose statistics library.
		expect(s.count).toBe(inside.length);
		expect(s.min).toBe(min(inside));
		expect(s.max).toBe(max(inside));
		expect(s.mean).toBeCloseTo(mean(inside), 10);
		expect(s.standardDeviation).toBeCloseTo(sampleStandardDeviation(inside), 10);
		expect(s.secondsAbove).toBeNull();
	});

	it('time above a threshold integrates the held value (checked on a 0.1 ms grid)', () => {
		const from = 0.333;
		const to = 3.111;
		const threshold = 42;
		// Brute force: step through the span and ask which sample holds at each instant.
		const step = 1e-4;
		let above = 0;
		for (let t = from + step / 2; t < to; t += step) {
			let i = -1;
			while (i + 1 < times.length && times[i + 1] <= t) i++;
			if (i >= 0 && values[i] > threshold) above += step;
		}
		const s = spanStatistics(channel, from, to, threshold);
		expect(s.secondsAbove!).toBeCloseTo(above, 2);
		expect(s.secondsCovered).toBeCloseTo(to - from, 9);
	});

	it('a span without samples has no statistics but may still hold a value', () => {
		const sparse = { time: Float64Array.from([0, 10]), value: Float64Array.from([5, 1]) };
		const s = spanStatistics(sparse, 2, 4, 3);
		expect(s).toMatchObject({ count: 0, min: null, mean: null, standardDeviation: null });
		expect(s.secondsAbove).toBeCloseTo(2, 12); // 5 held from t = 0 throughout
	});
});

describe('histogram', () => {
	it('counts every sample once, each in the bin its value falls in', () => {
		const h = histogram(channel, 0, 10, 12);
		expect(h.counts.reduce((a, b) => a + b, 0)).toBe(values.length);
		expect(h.edges[0]).toBe(min(values));
		expect(h.edges[12]).toBeCloseTo(max(values), 9);
		// Brute force per bin: left edge inclusive, right edge exclusive except the last bin.
		h.counts.forEach((count, k) => {
			const inBin = values.filter((v) =>
				k === 11 ? v >= h.edges[k] && v <= h.edges[k + 1] : v >= h.edges[k] && v < h.edges[k + 1]
			);
			expect(count).toBe(inBin.length);
		});
	});
});

describe('xyPairs', () => {
	it('pairs the held values at every time either channel has a sample', () => {
		const a = { time: Float64Array.from([0, 1, 2]), value: Float64Array.from([10, 20, 30]) };
		const b = { time: Float64Array.from([0.5, 1.5]), value: Float64Array.from([1, 2]) };
		const p = xyPairs(a, b, 0, 2, 100);
		// 0: b has no value yet; 0.5: (10,1); 1: (20,1); 1.5: (20,2); 2: (30,2).
		expect(p).toEqual({ x: [10, 20, 20, 30], y: [1, 1, 2, 2], total: 4 });
		expect(xyPairs(a, b, 0, 2, 2).x).toEqual([10, 20]);
	});
});
