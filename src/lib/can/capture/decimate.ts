/**
 * Min/max decimation of a channel for a plot: the visible time range is cut into `buckets` equal
 * slices (one per pixel column) and each slice keeps its smallest and largest sample, at the times
 * they occur. A one-sample spike therefore always survives, which averaging or picking every n-th
 * sample would lose. Cost: two binary searches plus one pass over the samples in the range.
 */

export interface Decimation {
	/** Points to draw, in time order: per non-empty slice its min and max (one point when they are the same sample). */
	time: Float64Array;
	value: Float64Array;
	/** true when the range held fewer than 2 × buckets samples, which are then returned as they are. */
	raw: boolean;
	/** Samples with a time in [from, to] (NaN values included). */
	inRange: number;
	/**
	 * Whether the first / last point is the nearest sample just outside [from, to], added so a
	 * panned plot draws its line to the edges instead of stopping at the first sample inside.
	 */
	leadingEdge: boolean;
	trailingEdge: boolean;
}

/** First index whose time is ≥ t (times non-decreasing). */
export function lowerBound(time: Float64Array, t: number): number {
	let lo = 0;
	let hi = time.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (time[mid] < t) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

/** First index whose time is > t (times non-decreasing). */
export function upperBound(time: Float64Array, t: number): number {
	let lo = 0;
	let hi = time.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (time[mid] <= t) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

/**
 * The slice a time falls in: slice k covers [from + k·w, from + (k+1)·w) with w = (to − from) / buckets;
 * the last slice also holds `to` itself. Exported so tests and callers share the one definition.
 */
export function bucketOf(t: number, from: number, to: number, buckets: number): number {
	if (to === from) return 0;
	const k = Math.floor(((t - from) / (to - from)) * buckets);
	return k < 0 ? 0 : k >= buckets ? buckets - 1 : k;
}

/** Index of the nearest non-NaN sample from `start` stepping by `step`, or -1. */
function nearestValid(value: Float64Array, start: number, step: 1 | -1): number {
	for (let i = start; i >= 0 && i < value.length; i += step) if (value[i] === value[i]) return i;
	return -1;
}

/**
 * Decimates the samples of (time, value) with a time in [from, to] to at most 2 × buckets points,
 * plus at most one neighbour on each side. `time` must be non-decreasing (a channel's times are);
 * NaN values are skipped.
 */
export function decimateMinMax(
	time: Float64Array,
	value: Float64Array,
	from: number,
	to: number,
	buckets: number
): Decimation {
	if (time.length !== value.length) {
		throw new RangeError(
			`time and value must have the same length (${time.length} ≠ ${value.length})`
		);
	}
	if (!Number.isFinite(from) || !Number.isFinite(to) || from > to) {
		throw new RangeError(
			`the range must be two finite times with from ≤ to, got from=${from}, to=${to}`
		);
	}
	if (!Number.isInteger(buckets) || buckets < 1) {
		throw new RangeError(`buckets must be a whole number of at least 1, got ${buckets}`);
	}
	const lo = lowerBound(time, from);
	const hi = upperBound(time, to);
	const inRange = hi - lo;
	const before = nearestValid(value, lo - 1, -1);
	const after = nearestValid(value, hi, 1);
	const raw = inRange < 2 * buckets;

	const outTime = new Float64Array((raw ? inRange : 2 * buckets) + 2);
	const outValue = new Float64Array(outTime.length);
	let n = 0;
	const emit = (i: number) => {
		outTime[n] = time[i];
		outValue[n++] = value[i];
	};

	if (before >= 0) emit(before);
	if (raw) {
		for (let i = lo; i < hi; i++) if (value[i] === value[i]) emit(i);
	} else {
		let bucket = -1;
		let minAt = -1;
		let maxAt = -1;
		const flush = () => {
			if (minAt < 0) return;
			// In time order, so the line between the two points is drawn the way the signal went.
			if (minAt === maxAt) emit(minAt);
			else if (minAt < maxAt) {
				emit(minAt);
				emit(maxAt);
			} else {
				emit(maxAt);
				emit(minAt);
			}
		};
		for (let i = lo; i < hi; i++) {
			const v = value[i];
			if (v !== v) continue;
			const k = bucketOf(time[i], from, to, buckets);
			if (k !== bucket) {
				flush();
				bucket = k;
				minAt = maxAt = i;
			} else if (v < value[minAt]) minAt = i;
			else if (v > value[maxAt]) maxAt = i;
		}
		flush();
	}
	if (after >= 0) emit(after);

	return {
		time: outTime.subarray(0, n),
		value: outValue.subarray(0, n),
		raw,
		inRange,
		leadingEdge: before >= 0,
		trailingEdge: after >= 0
	};
}
