/**
 * Which field of an unknown ID follows a known channel? Each candidate field is read from its
 * frames, the channel is interpolated linearly to those frame times (only inside the channel's
 * span and across gaps no longer than `maxGap`), and the pairs are scored by Pearson's r and
 * Spearman's ρ (Pearson of the ranks, ties sharing their mean rank; on at most SPEARMAN_MAX_PAIRS
 * pairs spread evenly over the capture). A least-squares line
 * channel ≈ raw × scale + offset proposes the signal's scaling; the scatter plot gets at most
 * `maxPoints` pairs, evenly spread over time.
 */
import { fieldFits, fieldLayout, readIntegerNumber } from '../bits';
import { lowerBound, upperBound } from '../capture/decimate';
import type { ByteOrder } from '../map';
import type { IdFrames } from './frames';
import type { FieldProposal } from './proposal';

export interface ChannelSamples {
	/** Seconds, non-decreasing (a decoded channel's times are). */
	time: Float64Array;
	value: Float64Array;
}

export interface CandidateField {
	id: number;
	extended: boolean;
	startBit: number;
	length: number;
	byteOrder: ByteOrder;
	signed: boolean;
	/** Only frames whose selector holds this value (a field of one multiplexor page); null = every frame. */
	page: { startBit: number; length: number; value: number } | null;
}

export interface FieldCorrelation {
	field: CandidateField;
	/** Frame times at which both the field and the channel had a value. */
	samples: number;
	/** null when either side does not vary (or fewer than 3 samples). */
	pearson: number | null;
	spearman: number | null;
	/** Least squares channel ≈ raw × scale + offset. */
	scale: number | null;
	offset: number | null;
	/** Root mean square of channel − (raw × scale + offset). */
	residual: number | null;
	/** Pairs for a scatter plot (raw value, channel value). */
	scatter: { raw: Float64Array; channel: Float64Array };
}

export interface CorrelationOptions {
	/** Most pairs returned for the scatter plot (default 2000). */
	maxPoints?: number;
	/** Longest channel gap (s) to interpolate across; default 5 × the channel's median sample spacing. */
	maxGap?: number;
}

/** The value proposals of one ID as correlation candidates (page values keep their page). */
export function candidatesFromProposals(
	frames: Pick<IdFrames, 'id' | 'extended'>,
	fields: readonly FieldProposal[]
): CandidateField[] {
	const mux = fields.find((f) => f.kind === 'mux');
	return fields.flatMap((f): CandidateField[] => {
		if (f.kind !== 'value') return [];
		const page =
			f.muxValue === null || !mux
				? null
				: { startBit: mux.startBit, length: mux.length, value: f.muxValue };
		const { startBit, length, byteOrder, signed } = f;
		return [
			{ id: frames.id, extended: frames.extended, startBit, length, byteOrder, signed, page }
		];
	});
}

function medianSpacing(time: Float64Array): number {
	const n = time.length - 1;
	if (n < 1) return Infinity;
	const take = Math.min(n, 1001);
	const gaps = new Float64Array(take);
	for (let s = 0; s < take; s++) {
		const k = Math.floor((s * n) / take);
		gaps[s] = time[k + 1] - time[k];
	}
	gaps.sort();
	return gaps[take >> 1];
}

/** Channel value at time t by linear interpolation, or NaN outside the span or across a long gap. */
function interpolate(channel: ChannelSamples, t: number, maxGap: number): number {
	const { time, value } = channel;
	const hi = lowerBound(time, t); // first sample at or after t
	if (hi < time.length && time[hi] === t) return value[upperBound(time, t) - 1];
	if (hi === 0 || hi === time.length) return NaN;
	const lo = hi - 1;
	const gap = time[hi] - time[lo];
	if (gap > maxGap) return NaN;
	return value[lo] + ((value[hi] - value[lo]) * (t - time[lo])) / gap;
}

function pearson(x: Float64Array, y: Float64Array, n: number) {
	let mx = 0;
	let my = 0;
	for (let i = 0; i < n; i++) {
		mx += x[i];
		my += y[i];
	}
	mx /= n;
	my /= n;
	let sxy = 0;
	let sxx = 0;
	let syy = 0;
	for (let i = 0; i < n; i++) {
		const dx = x[i] - mx;
		const dy = y[i] - my;
		sxy += dx * dy;
		sxx += dx * dx;
		syy += dy * dy;
	}
	return { mx, my, sxy, sxx, syy, r: sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : null };
}

/** Ranks 1…n, tied values sharing the mean of their ranks. */
function ranks(x: Float64Array, n: number): Float64Array {
	const sorted = x.slice(0, n).sort();
	// Distinct values in order, each with the mean rank of its run of ties.
	const distinct = new Float64Array(n);
	const meanRank = new Float64Array(n);
	let m = 0;
	for (let i = 0; i < n;) {
		let j = i;
		while (j + 1 < n && sorted[j + 1] === sorted[i]) j++;
		distinct[m] = sorted[i];
		meanRank[m++] = (i + j) / 2 + 1;
		i = j + 1;
	}
	const out = new Float64Array(n);
	for (let i = 0; i < n; i++) {
		let lo = 0;
		let hi = m - 1;
		while (lo < hi) {
			const mid = (lo + hi) >>> 1;
			if (distinct[mid] < x[i]) lo = mid + 1;
			else hi = mid;
		}
		out[i] = meanRank[lo];
	}
	return out;
}

/** Spearman's ρ is computed on at most this many pairs, evenly spread (ranking needs a sort). */
export const SPEARMAN_MAX_PAIRS = 4096;

/** The channel at every frame time of an ID (NaN where it has no value). */
function channelAtFrames(channel: ChannelSamples, frames: IdFrames, maxGap: number): Float64Array {
	const out = new Float64Array(frames.count);
	for (let i = 0; i < frames.count; i++) out[i] = interpolate(channel, frames.time[i], maxGap);
	return out;
}

/** `count` of the first `n` items, evenly spread (stride n / count). */
function thin(x: Float64Array, n: number, count: number): Float64Array {
	const out = new Float64Array(count);
	const stride = n / count;
	for (let s = 0; s < count; s++) out[s] = x[Math.floor(s * stride)];
	return out;
}

function correlateOne(
	channelAt: Float64Array,
	field: CandidateField,
	frames: IdFrames,
	maxPoints: number
): FieldCorrelation {
	const layout = fieldLayout(field.startBit, field.length, field.byteOrder);
	const pageLayout = field.page
		? fieldLayout(field.page.startBit, field.page.length, 'little')
		: null;
	const raw = new Float64Array(frames.count);
	const ch = new Float64Array(frames.count);
	let n = 0;
	for (let i = 0; i < frames.count; i++) {
		const base = i * frames.stride;
		const c = channelAt[i];
		if (c !== c || !fieldFits(layout, frames.length[i])) continue;
		if (pageLayout) {
			if (!fieldFits(pageLayout, frames.length[i])) continue;
			if (readIntegerNumber(frames.data, base, pageLayout, false) !== field.page!.value) continue;
		}
		raw[n] = readIntegerNumber(frames.data, base, layout, field.signed);
		ch[n] = c;
		n++;
	}
	const points = Math.min(n, maxPoints);
	const scatter = { raw: thin(raw, n, points), channel: thin(ch, n, points) };
	const none = { pearson: null, spearman: null, scale: null, offset: null, residual: null };
	if (n < 3) return { field, samples: n, ...none, scatter };
	const p = pearson(raw, ch, n);
	if (p.r === null) return { field, samples: n, ...none, scatter };
	const scale = p.sxy / p.sxx;
	const offset = p.my - scale * p.mx;
	// Residual sum of squares of the fitted line: Syy − Sxy² / Sxx.
	const residual = Math.sqrt(Math.max(0, p.syy - (p.sxy * p.sxy) / p.sxx) / n);
	const m = Math.min(n, SPEARMAN_MAX_PAIRS);
	const spearman = pearson(ranks(thin(raw, n, m), m), ranks(thin(ch, n, m), m), m).r;
	return { field, samples: n, pearson: p.r, spearman, scale, offset, residual, scatter };
}

/** Candidates ranked by |Pearson r|, then |Spearman ρ|; candidates without a score come last. */
export function correlateFields(
	channel: ChannelSamples,
	candidates: readonly { field: CandidateField; frames: IdFrames }[],
	options: CorrelationOptions = {}
): FieldCorrelation[] {
	if (channel.time.length !== channel.value.length) {
		throw new RangeError(
			`channel time and value must have the same length (${channel.time.length} ≠ ${channel.value.length})`
		);
	}
	const maxGap = options.maxGap ?? 5 * medianSpacing(channel.time);
	const maxPoints = Math.max(1, Math.floor(options.maxPoints ?? 2000));
	// Candidates of one ID share its frame times, so the channel is interpolated once per ID.
	const atFrames = new Map<IdFrames, Float64Array>();
	const results = candidates.map((c) => {
		let channelAt = atFrames.get(c.frames);
		if (!channelAt)
			atFrames.set(c.frames, (channelAt = channelAtFrames(channel, c.frames, maxGap)));
		return correlateOne(channelAt, c.field, c.frames, maxPoints);
	});
	const strength = (x: number | null) => (x === null ? -1 : Math.abs(x));
	return results.sort(
		(a, b) =>
			strength(b.pearson) - strength(a.pearson) || strength(b.spearman) - strength(a.spearman)
	);
}
