/**
 * Rolling counters: a run of bits whose raw value grows by a fixed step modulo 2^length from one
 * frame to the next. With an odd step the counter's least significant bit flips in every frame, so
 * only bits that flip in at least LSB_MIN_FLIP_RATE of frame pairs can start one. From there the
 * field grows one bit at a time up the chain of each byte order while the new bit behaves as the
 * carry predicts (docs/field-proposals.md gives the rule).
 */
import type { ByteOrder } from '../map';
import { isConstantBit, type BitStatistics, type FrameSet } from './bit-statistics';
import { bitAbove } from './chain';
import type { CounterProposal } from './proposal';
import { percent, round4, wilsonLower } from './statistics';

/** A counter must explain at least this share of frame pairs. */
export const COUNTER_MIN_SHARE = 0.8;
/** Bits flipping less often than this cannot be a counter's least significant bit. */
export const LSB_MIN_FLIP_RATE = 0.75;
/**
 * A bit joins the counter only if the frame pairs it breaks (pairs that followed the rule without
 * it and do not with it) are at most this share of the rarer of the pairs with and without a carry
 * out of the bits below: a counter bit flips as the carry and the step dictate, so it breaks none;
 * an unrelated bit (even one that toggles every frame) breaks at least the rare events it ignores.
 */
export const EXTENSION_BREAK_RATIO = 0.1;
const MAX_COUNTER_BITS = 32;

interface Growth {
	bits: number[];
	order: ByteOrder;
	step: number;
	followers: number;
}

/** The bit of every frame as 0/1. */
function bitColumn(set: FrameSet, bit: number, out: Uint8Array): Uint8Array {
	const { count, length: L, bytes } = set;
	const byte = bit >> 3;
	const shift = bit & 7;
	for (let k = 0; k < count; k++) out[k] = (bytes[k * L + byte] >> shift) & 1;
	return out;
}

/** Grows a counter from `lsb` up the chain of `order` while each new bit behaves as a counter bit. */
function grow(
	set: FrameSet,
	stats: BitStatistics,
	claimed: Uint8Array,
	lsb: number,
	order: ByteOrder
): Growth {
	const { count, length: L } = set;
	const pairs = count - 1;
	const column = new Uint8Array(count);
	const values = new Float64Array(count);
	bitColumn(set, lsb, column);
	for (let k = 0; k < count; k++) values[k] = column[k];
	const follows = new Uint8Array(pairs);
	for (let k = 0; k < pairs; k++) follows[k] = values[k + 1] !== values[k] ? 1 : 0;
	const bits = [lsb];
	let step = 1;
	let followers = stats.flips[lsb];
	let modulus = 2;
	for (;;) {
		const q = bitAbove(bits[bits.length - 1], order, L);
		if (q < 0 || claimed[q] || isConstantBit(stats, q) || bits.length >= MAX_COUNTER_BITS) break;
		bitColumn(set, q, column);
		const wider = modulus * 2;
		let same = 0; // pairs still following with the same step
		let carried = 0; // … with the step's new top bit set
		let carries = 0; // following pairs whose addition carries out of the bits so far
		for (let k = 0; k < pairs; k++) {
			if (!follows[k]) continue;
			if (values[k] + step >= modulus) carries++;
			let d = values[k + 1] + column[k + 1] * modulus - values[k] - column[k] * modulus;
			if (d < 0) d += wider;
			if (d === step) same++;
			else if (d === step + modulus) carried++;
		}
		const newStep = same >= carried ? step : step + modulus;
		const newFollowers = Math.max(same, carried);
		const broken = followers - newFollowers;
		// The new bit must flip on the carries (step bit 0) or on the pairs without one (step bit 1);
		// the rarer of the two is what an unrelated bit gets wrong.
		const events = Math.min(carries, followers - carries);
		if (events === 0 || broken > EXTENSION_BREAK_RATIO * events) break;
		if (newFollowers < COUNTER_MIN_SHARE * pairs) break;
		for (let k = 0; k < count; k++) values[k] += column[k] * modulus;
		for (let k = 0; k < pairs; k++) {
			if (!follows[k]) continue;
			let d = values[k + 1] - values[k];
			if (d < 0) d += wider;
			follows[k] = d === newStep ? 1 : 0;
		}
		step = newStep;
		followers = newFollowers;
		modulus = wider;
		bits.push(q);
	}
	return { bits, order, step, followers };
}

/** Counters among the bits not yet `claimed`; marks the bits of each one found in `claimed`. */
export function findCounters(
	set: FrameSet,
	stats: BitStatistics,
	claimed: Uint8Array
): CounterProposal[] {
	const found: CounterProposal[] = [];
	const pairs = stats.pairs;
	if (pairs < 2) return found;
	for (let lsb = 0; lsb < set.length * 8; lsb++) {
		if (claimed[lsb] || stats.flips[lsb] < LSB_MIN_FLIP_RATE * pairs) continue;
		const little = grow(set, stats, claimed, lsb, 'little');
		// The orders differ only once the counter reaches bit 7 of its byte.
		const big = little.bits.some((b) => (b & 7) === 7)
			? grow(set, stats, claimed, lsb, 'big')
			: little;
		const sameBits =
			little.bits.length === big.bits.length && little.bits.every((b, i) => b === big.bits[i]);
		const best =
			sameBits ||
			little.bits.length > big.bits.length ||
			(little.bits.length === big.bits.length && little.followers >= big.followers)
				? little
				: big;
		if (best.bits.length < 2 || best.followers < COUNTER_MIN_SHARE * pairs) continue;
		for (const b of best.bits) claimed[b] = 1;
		const share = best.followers / pairs;
		const length = best.bits.length;
		found.push({
			kind: 'counter',
			startBit: lsb,
			length,
			byteOrder: best.order,
			confidence: round4(wilsonLower(best.followers, pairs)),
			muxValue: null,
			evidence: `adds ${best.step} modulo ${2 ** length} from one frame to the next in ${percent(share)} of ${pairs} frame pairs`,
			step: best.step,
			share: round4(share),
			pairs
		});
	}
	return found;
}
