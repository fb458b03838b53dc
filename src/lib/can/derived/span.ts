/**
 * What the workbench measures over a time span of one channel (decoded or derived): statistics,
 * time above a threshold, a histogram, and the pairs of an XY plot of two channels. A channel holds
 * its latest value between samples (docs/derived-channels.md), so "time above" integrates the held
 * value over the span, including the value held from before its first sample inside.
 */
import { lowerBound, upperBound } from '../capture/decimate';
import { holdOnto, type SampledChannel } from './evaluate';

export interface SpanStatistics {
	/** Samples inside [from, to]. */
	count: number;
	min: number | null;
	max: number | null;
	mean: number | null;
	/** Sample standard deviation (n − 1); null below two samples. */
	standardDeviation: number | null;
	/** Seconds of the span during which the held value was above the threshold (null without one). */
	secondsAbove: number | null;
	/** Seconds of the span covered by a held value (from the first sample on). */
	secondsCovered: number;
}

export function spanStatistics(
	channel: SampledChannel,
	from: number,
	to: number,
	above?: number
): SpanStatistics {
	const time = channel.time;
	const value = channel.value;
	const start = lowerBound(time as Float64Array, from);
	const end = upperBound(time as Float64Array, to);
	let count = 0;
	let min = Infinity;
	let max = -Infinity;
	let mean = 0;
	let m2 = 0;
	// Welford's running mean and sum of squared differences: no catastrophic cancellation.
	for (let i = start; i < end; i++) {
		const v = value[i];
		if (!Number.isFinite(v)) continue;
		count++;
		const delta = v - mean;
		mean += delta / count;
		m2 += delta * (v - mean);
		if (v < min) min = v;
		if (v > max) max = v;
	}
	// Held intervals: the sample before the span (if any) holds from `from`, each sample until the next.
	let secondsAbove = 0;
	let secondsCovered = 0;
	for (let i = Math.max(0, start - 1); i < end; i++) {
		const a = Math.max(time[i], from);
		const b = Math.min(i + 1 < time.length ? time[i + 1] : to, to);
		if (b <= a) continue;
		secondsCovered += b - a;
		if (above !== undefined && value[i] > above) secondsAbove += b - a;
	}
	return {
		count,
		min: count ? min : null,
		max: count ? max : null,
		mean: count ? mean : null,
		standardDeviation: count > 1 ? Math.sqrt(m2 / (count - 1)) : null,
		secondsAbove: above === undefined ? null : secondsAbove,
		secondsCovered
	};
}

export interface Histogram {
	/** Bin edges: bins + 1 numbers from the smallest to the largest value. */
	edges: number[];
	counts: number[];
}

/** Equal-width bins from the span's smallest to largest sample; the last bin includes its right edge. */
export function histogram(
	channel: SampledChannel,
	from: number,
	to: number,
	bins: number
): Histogram {
	const start = lowerBound(channel.time as Float64Array, from);
	const end = upperBound(channel.time as Float64Array, to);
	let lo = Infinity;
	let hi = -Infinity;
	for (let i = start; i < end; i++) {
		const v = channel.value[i];
		if (!Number.isFinite(v)) continue;
		if (v < lo) lo = v;
		if (v > hi) hi = v;
	}
	if (!(lo <= hi)) return { edges: [], counts: [] };
	// A constant channel gets one bin of width 1 around its value.
	if (lo === hi) return { edges: [lo - 0.5, hi + 0.5], counts: [end - start] };
	const width = (hi - lo) / bins;
	const counts = new Array<number>(bins).fill(0);
	for (let i = start; i < end; i++) {
		const v = channel.value[i];
		if (!Number.isFinite(v)) continue;
		counts[Math.min(bins - 1, Math.floor((v - lo) / width))]++;
	}
	return { edges: Array.from({ length: bins + 1 }, (_, k) => lo + k * width), counts };
}

export interface XyPairs {
	x: number[];
	y: number[];
	/** Pairs in the span before thinning. */
	total: number;
}

/**
 * The two channels' values at every time either has a sample in the span (each holding its latest
 * value), thinned to at most `maxPoints` pairs by an even stride.
 */
export function xyPairs(
	a: SampledChannel,
	b: SampledChannel,
	from: number,
	to: number,
	maxPoints: number
): XyPairs {
	const times = new Set<number>();
	for (const c of [a, b])
		for (
			let i = lowerBound(c.time as Float64Array, from);
			i < c.time.length && c.time[i] <= to;
			i++
		)
			times.add(c.time[i]);
	const base = Float64Array.from(times).sort();
	const ha = holdOnto(a, base);
	const hb = holdOnto(b, base);
	const x: number[] = [];
	const y: number[] = [];
	let total = 0;
	for (let i = 0; i < base.length; i++)
		if (Number.isFinite(ha[i]) && Number.isFinite(hb[i])) total++;
	const stride = Math.max(1, Math.ceil(total / maxPoints));
	for (let i = 0, k = 0; i < base.length; i++) {
		if (!Number.isFinite(ha[i]) || !Number.isFinite(hb[i])) continue;
		if (k++ % stride === 0) {
			x.push(ha[i]);
			y.push(hb[i]);
		}
	}
	return { x, y, total };
}
