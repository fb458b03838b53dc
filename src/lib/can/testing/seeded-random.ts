/**
 * Seeded pseudo-random numbers for property tests, so a failing case reproduces from its seed.
 * mulberry32 (public-domain 32-bit generator by Tommy Ettinger).
 */
export function seededRandom(seed: number) {
	let state = seed >>> 0;
	const next = (): number => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	/** Whole number in [lo, hi]. */
	const int = (lo: number, hi: number): number => lo + Math.floor(next() * (hi - lo + 1));
	const bytes = (n: number): Uint8Array => Uint8Array.from({ length: n }, () => int(0, 255));
	const pick = <T>(items: readonly T[]): T => items[int(0, items.length - 1)];
	return { next, int, bytes, pick };
}
