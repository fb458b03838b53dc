/**
 * Measured values. A physical value moving by small steps flips its low bits often and its high
 * bits rarely, and when a high bit flips (a carry or borrow) the bit below it flips too. So a value
 * is proposed for a run of bits, along the chain of one byte order, in which every neighbouring
 * pair is "linked": the lower bit flips together with the upper one far more often than two
 * independent bits would (a binomial tail over the upper bit's flips), and the lower bit flips at
 * least about as often as the upper one. Low bits that flip like noise carry no such link; they are
 * added while they stay inside the byte of the run's lowest bit (fields usually start on a byte
 * boundary, and noise-like low bits cannot tell where they end), and a noise-like byte below joins
 * when its changes carry into the value's.
 */
import type { ByteOrder } from '../map';
import { fieldValues, isConstantBit, type BitStatistics, type FrameSet } from './bit-statistics';
import { bitAbove, bitBelow, chainOrder, fieldBits } from './chain';
import type { ValueProposal } from './proposal';
import { binomialTail, percent, round4 } from './statistics';

/**
 * Chance that independent bits flip together at least as often as seen (binomial tail over the
 * upper bit's flips, with the lower bit's flip rate): a link needs at most this…
 */
export const LINK_MAX_CHANCE = 1e-7;
/** … or, when every flip of the upper bit came with one of the lower bit (a carry), at most this. */
export const CARRY_MAX_CHANCE = 0.01;
/** The lower bit of a link must flip at least this share of the upper bit's rate. */
export const LINK_MIN_RATE_RATIO = 0.8;
/** A value needs at least this many linked bits. */
export const VALUE_MIN_LINKED_BITS = 3;
/** Low bits added below the linked run must flip at least this often (noise-like). */
export const NOISE_LIKE_MIN_RATE = 0.3;
/**
 * A whole byte below the value joins it when its change from frame to frame is negatively
 * correlated with the value's (a carry out of the low byte lowers it by 256 as the value above
 * rises by 1) at this many standard errors.
 */
export const LOW_BYTE_MIN_Z = 5;
const MAX_VALUE_BITS = 32;

interface Candidate {
	bits: number[]; // least significant first
	order: ByteOrder;
	linkedBits: number;
	lift: number; // mean normalised lift of the links
}

/** Normalised lift of the link lower → upper (how much more often they flip together), or null. */
export function link(
	stats: BitStatistics,
	order: ByteOrder,
	lower: number,
	upper: number
): number | null {
	const pairs = stats.pairs;
	const both = (order === 'little' ? stats.bothLittle : stats.bothBig)[lower];
	const k = stats.flips[upper];
	const r = stats.flips[lower] / pairs;
	if (both === 0 || r >= 1 || r < LINK_MIN_RATE_RATIO * (k / pairs)) return null;
	const chance = binomialTail(k, r, both);
	if (!(chance <= LINK_MAX_CHANCE || (both === k && chance <= CARRY_MAX_CHANCE))) return null;
	return (both / k - r) / (1 - r);
}

/** Pearson correlation of the frame-to-frame changes of two fields (as unsigned integers). */
function changeCorrelation(a: Float64Array, b: Float64Array): number {
	const n = a.length - 1;
	let ma = 0;
	let mb = 0;
	for (let k = 0; k < n; k++) {
		ma += a[k + 1] - a[k];
		mb += b[k + 1] - b[k];
	}
	ma /= n;
	mb /= n;
	let sab = 0;
	let saa = 0;
	let sbb = 0;
	for (let k = 0; k < n; k++) {
		const da = a[k + 1] - a[k] - ma;
		const db = b[k + 1] - b[k] - mb;
		sab += da * db;
		saa += da * da;
		sbb += db * db;
	}
	return saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : 0;
}

function candidates(
	set: FrameSet,
	stats: BitStatistics,
	eligible: Uint8Array,
	order: ByteOrder
): Candidate[] {
	const L = set.length;
	const usable = (bit: number) => bit >= 0 && eligible[bit] === 1 && !isConstantBit(stats, bit);
	const found: Candidate[] = [];
	const chain = chainOrder(order, L);
	let i = 0;
	while (i < chain.length) {
		// Longest run of links starting at chain[i].
		const bits = [chain[i]];
		const lifts: number[] = [];
		while (usable(bits[bits.length - 1]) && bits.length < MAX_VALUE_BITS) {
			const upper = bitAbove(bits[bits.length - 1], order, L);
			if (!usable(upper)) break;
			const lift = link(stats, order, bits[bits.length - 1], upper);
			if (lift === null) break;
			bits.push(upper);
			lifts.push(lift);
		}
		i += bits.length;
		if (bits.length < VALUE_MIN_LINKED_BITS) continue;
		const linkedBits = bits.length;
		// Noise-like low bits, down to the start of the lowest bit's byte.
		for (;;) {
			const bottom = bits[0];
			const below = bitBelow(bottom, order, L);
			if (below < 0 || below >> 3 !== bottom >> 3 || !usable(below)) break;
			if (stats.flips[below] / stats.pairs < NOISE_LIKE_MIN_RATE) break;
			if (bits.length >= MAX_VALUE_BITS) break;
			bits.unshift(below);
		}
		// Whole noise-like bytes below whose changes carry into the value.
		while (bits.length + 8 <= MAX_VALUE_BITS && (bits[0] & 7) === 0) {
			const low: number[] = [];
			for (
				let b = bitBelow(bits[0], order, L);
				low.length < 8 && b >= 0;
				b = bitBelow(b, order, L)
			) {
				low.unshift(b);
			}
			if (low.length < 8 || !low.every(usable)) break;
			if (low.some((b) => stats.flips[b] / stats.pairs < NOISE_LIKE_MIN_RATE)) break;
			const r = changeCorrelation(
				fieldValues(set, low[0], 8, order),
				fieldValues(set, bits[0], bits.length, order)
			);
			if (!(-r * Math.sqrt(stats.pairs) >= LOW_BYTE_MIN_Z)) break;
			bits.unshift(...low);
		}
		const lift = lifts.reduce((a, b) => a + b, 0) / lifts.length;
		found.push({ bits, order, linkedBits, lift });
	}
	return found;
}

/** Mean absolute change from frame to frame. */
function roughness(values: Float64Array): number {
	let sum = 0;
	for (let k = 1; k < values.length; k++) sum += Math.abs(values[k] - values[k - 1]);
	return sum / Math.max(1, values.length - 1);
}

/**
 * A value proposal for a field: signedness (the reading with the smaller mean change from frame to
 * frame), raw range and flip rates over `set`; `why` ends the evidence sentence.
 */
export function describeValue(
	set: FrameSet,
	stats: BitStatistics,
	field: { startBit: number; length: number; byteOrder: ByteOrder },
	confidence: number,
	muxValue: number | null,
	why: string
): ValueProposal {
	const { startBit, length, byteOrder } = field;
	const unsigned = fieldValues(set, startBit, length, byteOrder);
	const signedValues = new Float64Array(unsigned.length);
	const half = 2 ** (length - 1);
	for (let k = 0; k < unsigned.length; k++) {
		signedValues[k] = unsigned[k] >= half ? unsigned[k] - 2 * half : unsigned[k];
	}
	const signed = roughness(signedValues) < roughness(unsigned);
	const values = signed ? signedValues : unsigned;
	let rawMin = Infinity;
	let rawMax = -Infinity;
	for (const v of values) {
		if (v < rawMin) rawMin = v;
		if (v > rawMax) rawMax = v;
	}
	const flipRates = fieldBits(startBit, length, byteOrder, set.length).map((b) =>
		round4(stats.flips[b] / Math.max(1, stats.pairs))
	);
	const page = muxValue === null ? '' : ` on page ${muxValue}`;
	return {
		kind: 'value',
		startBit,
		length,
		byteOrder,
		confidence: round4(confidence),
		muxValue,
		evidence:
			`flip rate falls from ${percent(flipRates[0])} at the least significant bit to ` +
			`${percent(flipRates[length - 1])} at the most significant${page}; ${why}` +
			(signed ? '; smoother read as signed' : ''),
		signed,
		rawMin,
		rawMax,
		flipRates
	};
}

/** Values among the `eligible` bits (1 = may be used); `muxValue` labels per-page proposals. */
export function findValues(
	set: FrameSet,
	stats: BitStatistics,
	eligible: Uint8Array,
	muxValue: number | null
): ValueProposal[] {
	if (stats.pairs < 2) return [];
	const all = [
		...candidates(set, stats, eligible, 'little'),
		...candidates(set, stats, eligible, 'big')
	].sort((a, b) => b.bits.length - a.bits.length || b.lift - a.lift);
	const taken = new Uint8Array(set.length * 8);
	const found: ValueProposal[] = [];
	for (const c of all) {
		if (c.bits.some((b) => taken[b])) continue;
		for (const b of c.bits) taken[b] = 1;
		const startBit = c.bits[0];
		// Inside one byte both orders name the same bits; call it little-endian.
		const byteOrder = c.bits.every((b) => b >> 3 === startBit >> 3) ? 'little' : c.order;
		const confidence = Math.max(0, Math.min(1, c.lift)) * (c.linkedBits / c.bits.length);
		const why = `${c.linkedBits - 1} neighbouring bit pair(s) flip together far more often than chance (carries)`;
		found.push(
			describeValue(
				set,
				stats,
				{ startBit, length: c.bits.length, byteOrder },
				confidence,
				muxValue,
				why
			)
		);
	}
	return found;
}
