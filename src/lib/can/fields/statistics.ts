/** Small statistics shared by the detectors. */

/** z for a two-sided 95 % interval. */
export const Z95 = 1.959964;

/**
 * Lower end of the Wilson score interval (95 %) for `successes` out of `trials`: a share that
 * rewards more evidence — 10 out of 10 gives 0.72, 10,000 out of 10,000 gives 0.9996.
 */
export function wilsonLower(successes: number, trials: number, z = Z95): number {
	if (trials <= 0) return 0;
	const p = successes / trials;
	const z2 = z * z;
	const centre = p + z2 / (2 * trials);
	const spread = z * Math.sqrt((p * (1 - p)) / trials + z2 / (4 * trials * trials));
	return Math.max(0, (centre - spread) / (1 + z2 / trials));
}

/** Rounds shares and confidences for output (4 decimals is finer than any threshold here). */
export const round4 = (x: number) => Math.round(x * 1e4) / 1e4;

/** "99.9 %" */
export const percent = (x: number) =>
	`${x >= 0.999 && x < 1 ? (x * 100).toFixed(2) : (x * 100).toFixed(1)} %`;

/**
 * P(X ≥ x) for X ~ Binomial(n, p): summed exactly up to n = 400, beyond that the normal
 * approximation with continuity correction (then far from the small tails that matter here).
 */
export function binomialTail(n: number, p: number, x: number): number {
	if (x <= 0) return 1;
	if (x > n) return 0;
	if (p <= 0) return 0;
	if (p >= 1) return 1;
	if (n > 400) {
		const z = (x - 0.5 - n * p) / Math.sqrt(n * p * (1 - p));
		return 0.5 * erfc(z / Math.SQRT2);
	}
	// Terms in log space so (1 − p)^n cannot underflow.
	const logRatio = Math.log(p) - Math.log1p(-p);
	let logTerm = n * Math.log1p(-p); // log P(X = 0)
	let tail = 0;
	for (let j = 0; j < n; j++) {
		if (j >= x) tail += Math.exp(logTerm);
		logTerm += Math.log((n - j) / (j + 1)) + logRatio;
	}
	tail += Math.exp(logTerm); // j = n
	return Math.min(1, tail);
}

/** Complementary error function (Numerical Recipes' erfcc, relative error < 1.2e−7). */
export function erfc(x: number): number {
	const z = Math.abs(x);
	const t = 1 / (1 + 0.5 * z);
	const r =
		t *
		Math.exp(
			-z * z -
				1.26551223 +
				t *
					(1.00002368 +
						t *
							(0.37409196 +
								t *
									(0.09678418 +
										t *
											(-0.18628806 +
												t *
													(0.27886807 +
														t *
															(-1.13520398 +
																t * (1.48851587 + t * (-0.82215223 + t * 0.17087277))))))))
		);
	return x >= 0 ? r : 2 - r;
}
