/**
 * A min/max pyramid of one decoded channel, so a plot of any zoom window reads a bounded number of
 * points instead of every sample. Level 1 groups FANOUT consecutive samples into a node that keeps
 * the time of its first sample and its smallest and largest sample (value and time); each level
 * above groups FANOUT nodes of the level below. A window is answered from the coarsest level with
 * at least NODES_PER_BUCKET nodes per bucket in it (the finest when none has), so a window reads
 * between 2 and 2 · FANOUT nodes per bucket whatever the channel's length: each node's min and max points (real samples)
 * go to the bucket their time falls in, and each bucket keeps its smallest and largest. A one-sample
 * spike therefore always survives, as in decimate.ts; the difference is that bucket edges are
 * resolved to whole nodes (a node straddling an edge gives its extremes to the bucket they lie in).
 * Windows with few enough samples are answered exactly from the samples instead (see series code).
 */
import { bucketOf, type Decimation } from './decimate';

export const FANOUT = 32;
/** A level is coarse enough once it has this many nodes per bucket in the window. */
const NODES_PER_BUCKET = 2;

const PYRAMID_MAGIC = 0x50435746; // "FWCP"
const FORMAT_VERSION = 1;

/** One level: node k covers samples [k·FANOUT^L, (k+1)·FANOUT^L). */
export interface PyramidLevel {
	first: Float64Array;
	minTime: Float64Array;
	minValue: Float64Array;
	maxTime: Float64Array;
	maxValue: Float64Array;
}

export interface Pyramid {
	/** Samples of the channel. */
	count: number;
	/** levels[0] is level 1 (FANOUT samples per node); the last level has one node. */
	levels: PyramidLevel[];
}

/** A column grown in fixed blocks (no doubling, so memory stays close to what is held). */
class Growable {
	static BLOCK = 1 << 14;
	blocks: Float64Array[] = [];
	length = 0;
	push(v: number) {
		const at = this.length % Growable.BLOCK;
		if (at === 0) this.blocks.push(new Float64Array(Growable.BLOCK));
		this.blocks[this.blocks.length - 1][at] = v;
		this.length++;
	}
	get byteLength(): number {
		return this.blocks.length * Growable.BLOCK * 8;
	}
	done(): Float64Array {
		const out = new Float64Array(this.length);
		this.blocks.forEach((b, k) =>
			out.set(
				b.subarray(0, Math.min(Growable.BLOCK, this.length - k * Growable.BLOCK)),
				k * Growable.BLOCK
			)
		);
		this.blocks = [];
		return out;
	}
}

/** Builds a pyramid from samples streamed in time order (a channel's order), holding level 1 only. */
export class PyramidBuilder {
	#count = 0;
	#first = new Growable();
	#minTime = new Growable();
	#minValue = new Growable();
	#maxTime = new Growable();
	#maxValue = new Growable();
	// The node being filled.
	#inNode = 0;
	#nFirst = 0;
	#nMinT = 0;
	#nMinV = 0;
	#nMaxT = 0;
	#nMaxV = 0;

	add(time: ArrayLike<number>, value: ArrayLike<number>, n = time.length): void {
		for (let i = 0; i < n; i++) {
			const t = time[i];
			const v = value[i];
			if (this.#inNode === 0) {
				this.#nFirst = this.#nMinT = this.#nMaxT = t;
				this.#nMinV = this.#nMaxV = v;
			} else {
				if (v < this.#nMinV) {
					this.#nMinV = v;
					this.#nMinT = t;
				}
				if (v > this.#nMaxV) {
					this.#nMaxV = v;
					this.#nMaxT = t;
				}
			}
			if (++this.#inNode === FANOUT) this.#close();
		}
		this.#count += n;
	}

	#close(): void {
		this.#first.push(this.#nFirst);
		this.#minTime.push(this.#nMinT);
		this.#minValue.push(this.#nMinV);
		this.#maxTime.push(this.#nMaxT);
		this.#maxValue.push(this.#nMaxV);
		this.#inNode = 0;
	}

	/** Bytes held (for memory accounting). */
	get byteLength(): number {
		return this.#first.byteLength * 5;
	}

	finish(): Pyramid {
		if (this.#inNode > 0) this.#close();
		const levels: PyramidLevel[] = [];
		let level: PyramidLevel = {
			first: this.#first.done(),
			minTime: this.#minTime.done(),
			minValue: this.#minValue.done(),
			maxTime: this.#maxTime.done(),
			maxValue: this.#maxValue.done()
		};
		if (level.first.length === 0) return { count: 0, levels: [] };
		levels.push(level);
		while (level.first.length > 1) {
			level = parentLevel(level);
			levels.push(level);
		}
		return { count: this.#count, levels };
	}
}

function parentLevel(child: PyramidLevel): PyramidLevel {
	const n = Math.ceil(child.first.length / FANOUT);
	const up: PyramidLevel = {
		first: new Float64Array(n),
		minTime: new Float64Array(n),
		minValue: new Float64Array(n),
		maxTime: new Float64Array(n),
		maxValue: new Float64Array(n)
	};
	for (let k = 0; k < n; k++) {
		const a = k * FANOUT;
		const b = Math.min(child.first.length, a + FANOUT);
		let lo = a;
		let hi = a;
		for (let c = a + 1; c < b; c++) {
			if (child.minValue[c] < child.minValue[lo]) lo = c;
			if (child.maxValue[c] > child.maxValue[hi]) hi = c;
		}
		up.first[k] = child.first[a];
		up.minTime[k] = child.minTime[lo];
		up.minValue[k] = child.minValue[lo];
		up.maxTime[k] = child.maxTime[hi];
		up.maxValue[k] = child.maxValue[hi];
	}
	return up;
}

/** Samples under node k of level index `l` (levels[l] has FANOUT^(l+1) samples per node). */
export function nodeSamples(pyramid: Pyramid, l: number, k: number): number {
	const span = FANOUT ** (l + 1);
	return Math.max(0, Math.min(span, pyramid.count - k * span));
}

/** Last node whose first time is ≤ t (0 when none is). */
function nodeAt(first: Float64Array, t: number): number {
	let lo = 0;
	let hi = first.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (first[mid] <= t) lo = mid + 1;
		else hi = mid;
	}
	return Math.max(0, lo - 1);
}

/** The nodes of level index l that can hold samples in [from, to]: [k0, k1]. */
export function nodesInWindow(
	pyramid: Pyramid,
	l: number,
	from: number,
	to: number
): [number, number] {
	const first = pyramid.levels[l].first;
	return [nodeAt(first, from), nodeAt(first, to)];
}

/** Samples in the nodes of level 1 that can hold samples in [from, to]: an upper bound of the window's samples. */
export function samplesAround(pyramid: Pyramid, from: number, to: number): number {
	if (pyramid.levels.length === 0) return 0;
	const [k0, k1] = nodesInWindow(pyramid, 0, from, to);
	let n = 0;
	for (let k = k0; k <= k1; k++) n += nodeSamples(pyramid, 0, k);
	return n;
}

/**
 * The window [from, to] in `buckets` slices from the pyramid (see the file comment). `inRange` counts
 * the samples of the nodes whose first sample lies in the window, so it is exact to within one node
 * at each edge; `raw` is always false.
 */
export function queryPyramid(
	pyramid: Pyramid,
	from: number,
	to: number,
	buckets: number
): Decimation {
	if (!Number.isFinite(from) || !Number.isFinite(to) || from > to)
		throw new RangeError(`the range must be two finite times with from ≤ to, got ${from}, ${to}`);
	if (!Number.isInteger(buckets) || buckets < 1)
		throw new RangeError(`buckets must be a whole number of at least 1, got ${buckets}`);
	const empty: Decimation = {
		time: new Float64Array(0),
		value: new Float64Array(0),
		raw: false,
		inRange: 0,
		leadingEdge: false,
		trailingEdge: false
	};
	if (pyramid.levels.length === 0) return empty;
	// The coarsest level with enough nodes in the window (the finest when none has).
	let l = 0;
	let [k0, k1] = nodesInWindow(pyramid, 0, from, to);
	for (let up = 1; up < pyramid.levels.length; up++) {
		const [a, b] = nodesInWindow(pyramid, up, from, to);
		if (b - a + 1 < NODES_PER_BUCKET * buckets) break;
		[l, k0, k1] = [up, a, b];
	}
	const level = pyramid.levels[l];
	let inRange = 0;
	for (let k = k0; k <= k1; k++)
		if (level.first[k] >= from && level.first[k] <= to) inRange += nodeSamples(pyramid, l, k);

	const minT = new Float64Array(buckets).fill(NaN);
	const minV = new Float64Array(buckets);
	const maxT = new Float64Array(buckets).fill(NaN);
	const maxV = new Float64Array(buckets);
	const put = (t: number, v: number) => {
		if (!(t >= from && t <= to)) return;
		const b = bucketOf(t, from, to, buckets);
		if (minT[b] !== minT[b] || v < minV[b]) {
			minT[b] = t;
			minV[b] = v;
		}
		if (maxT[b] !== maxT[b] || v > maxV[b]) {
			maxT[b] = t;
			maxV[b] = v;
		}
	};
	// The latest extreme before the window and the earliest after it: edge points, so a line reaches the plot's edges.
	let beforeT = -Infinity;
	let beforeV = NaN;
	let afterT = Infinity;
	let afterV = NaN;
	const edge = (t: number, v: number) => {
		if (t < from && t > beforeT) {
			beforeT = t;
			beforeV = v;
		} else if (t > to && t < afterT) {
			afterT = t;
			afterV = v;
		}
	};
	const lo = Math.max(0, k0 - 1);
	const hi = Math.min(level.first.length - 1, k1 + 1);
	for (let k = lo; k <= hi; k++) {
		put(level.minTime[k], level.minValue[k]);
		put(level.maxTime[k], level.maxValue[k]);
		edge(level.minTime[k], level.minValue[k]);
		edge(level.maxTime[k], level.maxValue[k]);
	}
	const time: number[] = [];
	const value: number[] = [];
	const leadingEdge = beforeT > -Infinity;
	if (leadingEdge) {
		time.push(beforeT);
		value.push(beforeV);
	}
	for (let b = 0; b < buckets; b++) {
		if (minT[b] !== minT[b]) continue;
		if (minT[b] === maxT[b] && minV[b] === maxV[b]) {
			time.push(minT[b]);
			value.push(minV[b]);
		} else if (minT[b] <= maxT[b]) {
			time.push(minT[b], maxT[b]);
			value.push(minV[b], maxV[b]);
		} else {
			time.push(maxT[b], minT[b]);
			value.push(maxV[b], minV[b]);
		}
	}
	const trailingEdge = afterT < Infinity;
	if (trailingEdge) {
		time.push(afterT);
		value.push(afterV);
	}
	return {
		time: Float64Array.from(time),
		value: Float64Array.from(value),
		raw: false,
		inRange,
		leadingEdge,
		trailingEdge
	};
}

// ---------------------------------------------------------------- bytes

export function pyramidToBytes(pyramid: Pyramid): Uint8Array {
	const nodes = pyramid.levels.reduce((n, l) => n + l.first.length, 0);
	const header = 16 + 8 * pyramid.levels.length;
	const bytes = new Uint8Array(header + nodes * 40);
	const view = new DataView(bytes.buffer);
	view.setUint32(0, PYRAMID_MAGIC, true);
	view.setUint32(4, FORMAT_VERSION, true);
	view.setFloat64(8, pyramid.count, true);
	let at = header;
	pyramid.levels.forEach((level, l) => {
		view.setUint32(16 + 8 * l, level.first.length, true);
		for (const column of [
			level.first,
			level.minTime,
			level.minValue,
			level.maxTime,
			level.maxValue
		]) {
			bytes.set(new Uint8Array(column.buffer, column.byteOffset, column.byteLength), at);
			at += column.byteLength;
		}
	});
	return bytes;
}

export function pyramidFromBytes(bytes: Uint8Array): Pyramid {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	if (bytes.byteLength < 16 || view.getUint32(0, true) !== PYRAMID_MAGIC)
		throw new Error('not a stored channel pyramid: wrong magic number');
	if (view.getUint32(4, true) !== FORMAT_VERSION)
		throw new Error('stored channel pyramid format is not supported');
	const count = view.getFloat64(8, true);
	const levels: PyramidLevel[] = [];
	// Level sizes follow from the count: ceil(count / FANOUT), then ceil(previous / FANOUT) down to 1.
	const sizes: number[] = [];
	for (let n = Math.ceil(count / FANOUT); n > 0; n = n === 1 ? 0 : Math.ceil(n / FANOUT))
		sizes.push(n);
	let at = 16 + 8 * sizes.length;
	if (bytes.byteLength !== at + 40 * sizes.reduce((a, b) => a + b, 0))
		throw new Error('stored channel pyramid is damaged: wrong length');
	for (const [l, n] of sizes.entries()) {
		if (view.getUint32(16 + 8 * l, true) !== n)
			throw new Error('stored channel pyramid is damaged: level sizes do not match');
		const take = () => {
			const copy = new Float64Array(bytes.slice(at, at + 8 * n).buffer);
			at += 8 * n;
			return copy;
		};
		levels.push({
			first: take(),
			minTime: take(),
			minValue: take(),
			maxTime: take(),
			maxValue: take()
		});
	}
	if (at !== bytes.byteLength) throw new Error('stored channel pyramid is damaged: wrong length');
	return { count, levels };
}

export function pyramidBytes(pyramid: Pyramid): number {
	return pyramid.levels.reduce((n, l) => n + 40 * l.first.length, 0);
}
