import { binomialDistribution, errorFunction } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { binomialTail, erfc, wilsonLower, Z95 } from './statistics';

describe('wilsonLower', () => {
	it('solves the defining equation of the Wilson score interval', () => {
		// Wilson (1927): the interval holds the p with |p̂ − p| = z·√(p(1 − p)/n) at its ends.
		for (const [x, n] of [
			[10, 10],
			[9, 10],
			[4999, 5000],
			[1, 3],
			[500, 1000]
		]) {
			const low = wilsonLower(x, n);
			const p = x / n;
			expect(low).toBeLessThan(p);
			expect(Math.abs(p - low)).toBeCloseTo(Z95 * Math.sqrt((low * (1 - low)) / n), 12);
		}
	});

	it('is 0 without trials', () => {
		expect(wilsonLower(0, 0)).toBe(0);
	});
});

describe('binomialTail', () => {
	it('matches the tail summed from exact binomial coefficients and from simple-statistics', () => {
		// Reference 1: P(X = k) = C(n, k) pᵏ (1 − p)ⁿ⁻ᵏ with C(n, k) computed exactly in BigInt.
		const choose = (n: number, k: number) => {
			let c = 1n;
			for (let i = 1; i <= k; i++) c = (c * BigInt(n - k + i)) / BigInt(i);
			return Number(c);
		};
		for (const [n, p] of [
			[1, 0.004],
			[10, 0.5],
			[40, 0.1],
			[200, 0.3]
		]) {
			// Reference 2: simple-statistics' binomialDistribution, which stops once the cumulative
			// probability passes 1 − 1e−4 (so its tails agree to about 1e−4).
			const pmf = binomialDistribution(n, p)!;
			for (let x = 0; x <= n; x += Math.max(1, Math.floor(n / 10))) {
				let exact = 0;
				for (let k = x; k <= n; k++) exact += choose(n, k) * p ** k * (1 - p) ** (n - k);
				expect(binomialTail(n, p, x)).toBeCloseTo(exact, 9);
				const library = pmf.slice(x).reduce((a, b) => a + b, 0);
				expect(Math.abs(binomialTail(n, p, x) - library)).toBeLessThan(2e-4);
			}
		}
	});

	it('uses a normal approximation for large n that stays close to the exact sum', () => {
		// Exact tail at n = 400 against the approximation at n = 401 (continuity corrected).
		const exact = binomialTail(400, 0.5, 220);
		expect(Math.abs(binomialTail(401, 0.5, 220.5) - exact)).toBeLessThan(0.01);
	});
});

describe('erfc', () => {
	it('matches 1 − erf of simple-statistics', () => {
		for (const x of [-2, -0.5, 0, 0.3, 1, 2.5, 4]) {
			// simple-statistics' errorFunction is accurate to about 1e−7 as well.
			expect(erfc(x)).toBeCloseTo(1 - errorFunction(x), 6);
		}
	});
});
