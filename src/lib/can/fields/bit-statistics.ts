/**
 * The frames a detector reads (one payload length, packed back to back) and the per-bit counts
 * every detector starts from: how often each bit is 1, how often it flips from one frame to the
 * next, and how often it flips together with the bit above it in each byte order.
 * Counting goes through per-byte histograms (one increment per byte and frame), which are then
 * spread over the eight bits, so the cost does not grow with the number of flipping bits.
 */
import { readUnsigned32 } from '../bits';
import type { ByteOrder } from '../map';
import type { IdFrames } from './frames';

/** Frames of one payload length, `bytes[k·length + b]` = byte b of frame k, in time order. */
export interface FrameSet {
	count: number;
	length: number;
	bytes: Uint8Array;
	/** Seconds, one per frame. */
	time: Float64Array;
}

/** The frames with the most common payload length (ties: the longer length). */
export function modalFrameSet(frames: IdFrames): FrameSet {
	const perLength = new Uint32Array(65);
	for (let i = 0; i < frames.count; i++) perLength[frames.length[i]]++;
	let length = 0;
	for (let l = 0; l <= 64; l++)
		if (perLength[l] > 0 && perLength[l] >= perLength[length]) length = l;
	const count = frames.count === 0 ? 0 : perLength[length];
	const bytes = new Uint8Array(count * length);
	const time = new Float64Array(count);
	let k = 0;
	for (let i = 0; i < frames.count; i++) {
		if (frames.length[i] !== length) continue;
		const from = i * frames.stride;
		for (let b = 0; b < length; b++) bytes[k * length + b] = frames.data[from + b];
		time[k++] = frames.time[i];
	}
	return { count, length, bytes, time };
}

/** The frames at `indices` (ascending), as a set of their own. */
export function subset(set: FrameSet, indices: ArrayLike<number>): FrameSet {
	const { length } = set;
	const bytes = new Uint8Array(indices.length * length);
	const time = new Float64Array(indices.length);
	for (let k = 0; k < indices.length; k++) {
		const i = indices[k];
		for (let b = 0; b < length; b++) bytes[k * length + b] = set.bytes[i * length + b];
		time[k] = set.time[i];
	}
	return { count: indices.length, length, bytes, time };
}

export interface BitStatistics {
	count: number;
	/** Consecutive frame pairs: count − 1 (0 when empty). */
	pairs: number;
	ones: Uint32Array;
	flips: Uint32Array;
	/** both[order][b]: pairs in which bit b and the bit above it in that order both flipped. */
	bothLittle: Uint32Array;
	bothBig: Uint32Array;
}

/** Spreads byte-value histograms (256 bins per byte) into per-bit counts. */
export function spreadHistogram(histogram: Uint32Array, length: number, out: Uint32Array): void {
	for (let b = 0; b < length; b++) {
		for (let v = 1; v < 256; v++) {
			const n = histogram[b * 256 + v];
			if (n === 0) continue;
			for (let j = 0; j < 8; j++) if (v & (1 << j)) out[b * 8 + j] += n;
		}
	}
}

export function bitStatistics(set: FrameSet): BitStatistics {
	const { count, length: L, bytes } = set;
	const valueHistogram = new Uint32Array(L * 256);
	const flipHistogram = new Uint32Array(L * 256);
	// Pairs across a byte boundary, per boundary b | b + 1: bit 7 of byte b with bit 0 of byte b + 1
	// (neighbours in little-endian) and bit 7 of byte b + 1 with bit 0 of byte b (in big-endian).
	const crossLittle = new Uint32Array(Math.max(L, 1));
	const crossBig = new Uint32Array(Math.max(L, 1));
	for (let b = 0; b < L; b++) if (count > 0) valueHistogram[b * 256 + bytes[b]]++;
	for (let k = 1; k < count; k++) {
		const at = k * L;
		let previousX = 0;
		for (let b = 0; b < L; b++) {
			const v = bytes[at + b];
			const x = v ^ bytes[at - L + b];
			valueHistogram[b * 256 + v]++;
			flipHistogram[b * 256 + x]++;
			if (b > 0) {
				if (previousX & 0x80 & (x << 7)) crossLittle[b - 1]++;
				if (x & 0x80 & (previousX << 7)) crossBig[b - 1]++;
			}
			previousX = x;
		}
	}
	const ones = new Uint32Array(L * 8);
	const flips = new Uint32Array(L * 8);
	spreadHistogram(valueHistogram, L, ones);
	spreadHistogram(flipHistogram, L, flips);
	// Within a byte, bit j and j + 1 are neighbours in both orders.
	const bothLittle = new Uint32Array(L * 8);
	for (let b = 0; b < L; b++) {
		for (let x = 3; x < 256; x++) {
			const n = flipHistogram[b * 256 + x];
			if (n === 0) continue;
			const pairs = x & (x >> 1);
			for (let j = 0; j < 7; j++) if (pairs & (1 << j)) bothLittle[b * 8 + j] += n;
		}
	}
	const bothBig = bothLittle.slice();
	for (let b = 0; b + 1 < L; b++) {
		bothLittle[b * 8 + 7] = crossLittle[b]; // little: above bit 7 of byte b is bit 0 of byte b + 1
		bothBig[(b + 1) * 8 + 7] = crossBig[b]; // big: above bit 7 of byte b + 1 is bit 0 of byte b
	}
	return { count, pairs: Math.max(0, count - 1), ones, flips, bothLittle, bothBig };
}

export function isConstantBit(stats: BitStatistics, bit: number): boolean {
	return stats.ones[bit] === 0 || stats.ones[bit] === stats.count;
}

/** Unsigned raw values (≤ 32 bits) of a field in every frame of the set. */
export function fieldValues(
	set: FrameSet,
	startBit: number,
	length: number,
	order: ByteOrder
): Float64Array {
	const out = new Float64Array(set.count);
	const { bytes, length: L } = set;
	const step = order === 'little' ? 1 : -1;
	const lsbByte = startBit >> 3;
	const shift = startBit & 7;
	if (shift + length <= 24) {
		// Fits in three bytes: plain integer arithmetic, no general reader needed.
		const mask = (1 << length) - 1;
		const second = lsbByte + step;
		const third = lsbByte + 2 * step;
		const spans = (shift + length + 7) >> 3;
		for (let k = 0; k < set.count; k++) {
			const at = k * L;
			let acc = bytes[at + lsbByte];
			if (spans > 1) acc |= bytes[at + second] << 8;
			if (spans > 2) acc |= bytes[at + third] << 16;
			out[k] = (acc >> shift) & mask;
		}
		return out;
	}
	for (let k = 0; k < set.count; k++) {
		out[k] = readUnsigned32(bytes, k * L, lsbByte, shift, length, step);
	}
	return out;
}
