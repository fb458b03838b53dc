/**
 * Multiplexor candidates. A selector field sends different signals on different pages, so the bits
 * it switches change often from one frame to the next (the page changes) but seldom between two
 * frames of the same page. For a candidate selector (a run of changing bits inside one byte, at
 * most MUX_MAX_PAGES values), each other bit's flip rate between consecutive frames g is compared
 * with its flip rate between consecutive frames of the same page w; a bit is "switched" when
 * w ≤ SWITCH_RATIO · g. Candidates are ranked on a run of consecutive frames by Σ (g − w) over
 * switched bits; the best is checked on every frame.
 */
import type { ByteOrder } from '../map';
import { spreadHistogram, type BitStatistics, type FrameSet } from './bit-statistics';
import { link } from './values';
import { bitAbove, bitBelow } from './chain';
import type { CounterProposal, MuxProposal } from './proposal';
import { percent, round4 } from './statistics';

export const MUX_MAX_PAGES = 16;
/** Fewer frames than this give too few pairs per page to judge. */
export const MUX_MIN_FRAMES = 64;
/** Pages with fewer frames are ignored, and may hold at most RARE_PAGE_SHARE of the frames together. */
export const MUX_MIN_PAGE_FRAMES = 8;
const RARE_PAGE_SHARE = 0.01;
export const MUX_MIN_SWITCHED_BITS = 4;
export const SWITCH_RATIO = 0.5;
/** A bit must flip at least this often between consecutive frames to count as switched. */
const MIN_SWITCHED_FLIPS = 8;
/** Selectors are looked for in the first bytes of the payload. */
const SEARCH_BYTES = 8;
/** Frames of the quick first ranking, and how many selectors it passes on. */
const QUICK_FRAMES = 128;
const SHORTLIST = 8;
/** Payload bytes read per shortlisted selector in the second ranking (512 frames of 8 bytes). */
const RANKING_BYTES = 4096;

interface Selector {
	startBit: number;
	length: number;
}

interface PageFlips {
	/** Frames per selector value. */
	pageFrames: Uint32Array;
	within: Uint32Array;
	withinPairs: number;
}

const selectorValue = (set: FrameSet, k: number, s: Selector) =>
	(set.bytes[k * set.length + (s.startBit >> 3)] >> (s.startBit & 7)) & ((1 << s.length) - 1);

/**
 * Flips between consecutive frames of the same page over frames [from, to), counted only for the
 * bits in `mask` (one byte mask per payload byte); pages not in `usePage` are skipped.
 */
function pageFlips(
	set: FrameSet,
	s: Selector,
	from: number,
	to: number,
	mask: Uint8Array,
	usePage?: Uint8Array
): PageFlips {
	const L = set.length;
	const bytes = set.bytes;
	const pageFrames = new Uint32Array(256);
	const previous = new Int32Array(256).fill(-1);
	const within = new Uint32Array(L * 8);
	let withinPairs = 0;
	for (let k = from; k < to; k++) {
		const v = selectorValue(set, k, s);
		pageFrames[v]++;
		if (usePage && !usePage[v]) continue;
		const p = previous[v];
		previous[v] = k;
		if (p < 0) continue;
		withinPairs++;
		const a = k * L;
		const b = p * L;
		for (let j = 0; j < L; j++) {
			let x = (bytes[a + j] ^ bytes[b + j]) & mask[j];
			while (x !== 0) {
				const low = x & -x;
				within[j * 8 + 31 - Math.clz32(low)]++;
				x ^= low;
			}
		}
	}
	return { pageFrames, within, withinPairs };
}

/** Flips between consecutive frames over [from, to). */
function runFlips(set: FrameSet, from: number, to: number): Uint32Array {
	const L = set.length;
	const histogram = new Uint32Array(L * 256);
	for (let k = from + 1; k < to; k++) {
		for (let j = 0; j < L; j++)
			histogram[j * 256 + (set.bytes[k * L + j] ^ set.bytes[(k - 1) * L + j])]++;
	}
	const flips = new Uint32Array(L * 8);
	spreadHistogram(histogram, L, flips);
	return flips;
}

interface Score {
	score: number;
	switched: number[];
	reduction: number; // mean 1 − w/g over switched bits
}

/**
 * A selector must not be part of a value. The sign-extension bits above a small signed value, for
 * one, all follow its sign and so look "switched" by any of them; but they flip together with the
 * bits below them as carries do (the link test of the value detector), which a selector does not.
 */
function partOfValue(stats: BitStatistics, s: Selector, other: Uint8Array, L: number): boolean {
	const end = s.startBit + s.length - 1;
	const pairs: [number, number, ByteOrder][] = [
		[bitBelow(s.startBit, 'little', L), s.startBit, 'little'],
		[bitBelow(s.startBit, 'big', L), s.startBit, 'big'],
		[end, bitAbove(end, 'little', L), 'little'],
		[end, bitAbove(end, 'big', L), 'big']
	];
	return pairs.some(([lower, upper, order]) => {
		const outside = lower === end ? upper : lower;
		return outside >= 0 && other[outside] === 1 && link(stats, order, lower, upper) !== null;
	});
}

function score(
	s: Selector,
	range: { from: number; to: number },
	global: Uint32Array,
	pf: PageFlips,
	other: Uint8Array
): Score {
	const switched: number[] = [];
	const globalPairs = range.to - range.from - 1;
	let total = 0;
	let reduction = 0;
	if (pf.withinPairs === 0 || globalPairs <= 0) return { score: 0, switched, reduction };
	for (let b = 0; b < other.length; b++) {
		if (!other[b] || (b >= s.startBit && b < s.startBit + s.length)) continue;
		if (global[b] < MIN_SWITCHED_FLIPS) continue;
		const g = global[b] / globalPairs;
		const w = pf.within[b] / pf.withinPairs;
		if (w > SWITCH_RATIO * g) continue;
		switched.push(b);
		total += g - w;
		reduction += 1 - w / g;
	}
	return { score: total, switched, reduction: switched.length ? reduction / switched.length : 0 };
}

export interface MuxFinding {
	proposal: MuxProposal;
	/** Frame indices of each kept page, by selector value. */
	pages: Map<number, Uint32Array>;
	switched: number[];
	/** The counter the selector coincides with, if any (it is then reported as the selector). */
	counter: CounterProposal | null;
}

/**
 * `selectable[bit]` = 1 for bits a selector may use (changing, not a checksum); `other[bit]` = 1 for
 * bits that may be switched (changing, not claimed). A selector may coincide with a counter.
 */
export function findMux(
	set: FrameSet,
	stats: BitStatistics,
	selectable: Uint8Array,
	other: Uint8Array,
	counters: CounterProposal[]
): MuxFinding | null {
	const { count, length: L } = set;
	if (count < MUX_MIN_FRAMES) return null;
	const counterOf = (s: Selector) =>
		counters.find(
			(c) => c.startBit === s.startBit && c.length === s.length && c.byteOrder === 'little'
		) ?? null;
	const overlapsCounter = (s: Selector) =>
		counters.some((c) => {
			for (let i = 0; i < s.length; i++) {
				const b = s.startBit + i;
				if (b >= c.startBit && b < c.startBit + c.length && c.byteOrder === 'little') return true;
			}
			return false;
		});

	// Candidates: runs of selectable bits inside one of the first bytes with 2…MUX_MAX_PAGES values
	// on a short run of consecutive frames from the middle of the capture.
	const middleRun = (frames: number) => {
		const n = Math.min(count, frames);
		const from = Math.floor((count - n) / 2);
		return { from, to: from + n };
	};
	const quick = middleRun(QUICK_FRAMES);
	const selectors: Selector[] = [];
	const values = new Uint8Array(256);
	for (let byte = 0; byte < Math.min(L, SEARCH_BYTES); byte++) {
		for (let shift = 0; shift < 8; shift++) {
			for (let length = 1; shift + length <= 8; length++) {
				const s = { startBit: byte * 8 + shift, length };
				if (!selectable[s.startBit + length - 1]) break; // longer runs would include it too
				if (overlapsCounter(s) && !counterOf(s)) continue;
				if (partOfValue(stats, s, other, L)) continue;
				values.fill(0);
				let distinct = 0;
				for (let k = quick.from; k < quick.to && distinct <= MUX_MAX_PAGES; k++) {
					const v = selectorValue(set, k, s);
					if (!values[v]) distinct++;
					values[v] = 1;
				}
				if (distinct >= 2 && distinct <= MUX_MAX_PAGES) selectors.push(s);
			}
		}
	}
	/** Scores each selector on a run; only bits that flip often enough there are counted. */
	const rank = (list: Selector[], frames: number, minSwitched: number) => {
		const { from, to } = middleRun(frames);
		const global = runFlips(set, from, to);
		const mask = new Uint8Array(L);
		for (let b = 0; b < L * 8; b++) {
			if (other[b] && global[b] >= MIN_SWITCHED_FLIPS) mask[b >> 3] |= 1 << (b & 7);
		}
		const ranked: { s: Selector; score: Score }[] = [];
		for (const s of list) {
			const sc = score(s, { from, to }, global, pageFlips(set, s, from, to, mask), other);
			if (sc.switched.length >= minSwitched) ranked.push({ s, score: sc });
		}
		return ranked.sort((a, b) => b.score.score - a.score.score);
	};
	// A quick pass over few frames keeps the most promising selectors for a longer run.
	const shortlist = rank(selectors, QUICK_FRAMES, 2)
		.slice(0, SHORTLIST)
		.map((c) => c.s);
	const candidates = rank(
		shortlist,
		Math.max(QUICK_FRAMES, Math.floor(RANKING_BYTES / L)),
		MUX_MIN_SWITCHED_BITS
	);
	if (candidates.length === 0) return null;
	const best = Math.max(...candidates.map((c) => c.score.score));
	// Among candidates close to the best, the shortest selector: extra bits add pages, not explanation.
	const chosen = candidates
		.filter((c) => c.score.score >= 0.95 * best)
		.sort((a, b) => a.s.length - b.s.length || a.s.startBit - b.s.startBit)[0].s;

	// Check on every frame: pages with too few frames are set aside, then the switched bits recounted.
	const all = pageFlips(set, chosen, 0, count, new Uint8Array(L)); // page sizes only
	const everyBit = new Uint8Array(L).fill(0xff);
	const keep = new Uint8Array(256);
	let rare = 0;
	let pageCount = 0;
	for (let v = 0; v < 256; v++) {
		if (all.pageFrames[v] >= MUX_MIN_PAGE_FRAMES) {
			keep[v] = 1;
			pageCount++;
		} else rare += all.pageFrames[v];
	}
	if (pageCount < 2 || pageCount > MUX_MAX_PAGES || rare > RARE_PAGE_SHARE * count) return null;
	const kept = pageFlips(set, chosen, 0, count, everyBit, keep);
	const final = score(chosen, { from: 0, to: count }, stats.flips, kept, other);
	if (final.switched.length < MUX_MIN_SWITCHED_BITS) return null;

	const pages = new Map<number, Uint32Array>();
	const fill = new Map<number, number>();
	for (let v = 0; v < 256; v++) if (keep[v]) pages.set(v, new Uint32Array(all.pageFrames[v]));
	for (let k = 0; k < count; k++) {
		const v = selectorValue(set, k, chosen);
		const list = pages.get(v);
		if (!list) continue;
		const at = fill.get(v) ?? 0;
		list[at] = k;
		fill.set(v, at + 1);
	}
	const counter = counterOf(chosen);
	const pageList = [...pages.entries()].map(([value, frames]) => ({
		value,
		frames: frames.length
	}));
	return {
		pages,
		switched: final.switched,
		counter,
		proposal: {
			kind: 'mux',
			startBit: chosen.startBit,
			length: chosen.length,
			byteOrder: 'little',
			confidence: round4(final.reduction),
			muxValue: null,
			evidence:
				`${pageList.length} pages; ${final.switched.length} other bits change between consecutive frames ` +
				`but far less between frames of the same page (on average ${percent(final.reduction)} fewer flips)` +
				(counter ? `; the selector also advances by ${counter.step} each frame` : ''),
			pages: pageList,
			switchedBits: final.switched,
			counterStep: counter ? counter.step : null
		}
	};
}
