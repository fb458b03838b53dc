// Pyramid windows against a brute-force scan of the raw samples: nodes are rebuilt here by slicing the
// sample arrays (index ÷ 16^L), not from the pyramid's arrays.
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { bucketOf } from './decimate';
import {
	FANOUT,
	PyramidBuilder,
	pyramidFromBytes,
	pyramidToBytes,
	queryPyramid,
	samplesAround
} from './pyramid';

function channel(seed: number, n: number) {
	const rand = seededRandom(seed);
	const time = new Float64Array(n);
	const value = new Float64Array(n);
	let t = 0;
	for (let i = 0; i < n; i++) {
		t += rand.next() < 0.02 ? 0 : rand.next() * 0.01; // some equal times
		time[i] = t;
		value[i] = rand.next() < 0.001 ? rand.int(-1e6, 1e6) : Math.sin(i / 50) * 100 + rand.int(-5, 5);
	}
	return { time, value };
}

/** Brute force: the extremes of each run of `span` samples, as (time, value) points. */
function bruteNodes(time: Float64Array, value: Float64Array, span: number) {
	const nodes: { first: number; min: [number, number]; max: [number, number] }[] = [];
	for (let a = 0; a < time.length; a += span) {
		let lo = a;
		let hi = a;
		for (let i = a; i < Math.min(time.length, a + span); i++) {
			if (value[i] < value[lo]) lo = i;
			if (value[i] > value[hi]) hi = i;
		}
		nodes.push({ first: time[a], min: [time[lo], value[lo]], max: [time[hi], value[hi]] });
	}
	return nodes;
}

describe('min/max pyramid', () => {
	const { time, value } = channel(7, 300_001);
	const builder = new PyramidBuilder();
	// Fed in uneven pieces, as segments arrive.
	for (let at = 0; at < time.length;) {
		const n = Math.min(time.length - at, 1 + ((at * 7919) % 5000));
		builder.add(time.subarray(at, at + n), value.subarray(at, at + n));
		at += n;
	}
	const pyramid = builder.finish();

	it('holds every level a brute-force grouping gives, and survives its bytes', () => {
		expect(pyramid.count).toBe(time.length);
		pyramid.levels.forEach((level, l) => {
			const nodes = bruteNodes(time, value, FANOUT ** (l + 1));
			expect(Array.from(level.first)).toEqual(nodes.map((n) => n.first));
			expect(Array.from(level.minValue)).toEqual(nodes.map((n) => n.min[1]));
			expect(Array.from(level.maxValue)).toEqual(nodes.map((n) => n.max[1]));
		});
		expect(pyramid.levels.at(-1)!.first.length).toBe(1);
		expect(pyramidFromBytes(pyramidToBytes(pyramid))).toEqual(pyramid);
		expect(() => pyramidFromBytes(pyramidToBytes(pyramid).subarray(0, 100))).toThrow(/damaged/);
	});

	it.each([
		[0, 1500, 50],
		[100, 101, 300],
		[12.3456, 250.5, 2000],
		[-5, 1e6, 10],
		[350, 350, 7],
		[200, 1200, 1]
	])(
		'window [%f, %f] in %i buckets: each bucket holds the extremes of the nodes in it',
		(from, to, buckets) => {
			const d = queryPyramid(pyramid, from, to, buckets);
			expect(d.raw).toBe(false);
			expect(d.time.length).toBeLessThanOrEqual(2 * buckets + 2);
			// Every point is a real sample.
			const sample = new Map<number, Set<number>>();
			time.forEach((t, i) => sample.set(t, (sample.get(t) ?? new Set()).add(value[i])));
			d.time.forEach((t, k) => expect(sample.get(t)?.has(d.value[k])).toBe(true));
			// The level used: the coarsest with at least 2 nodes per bucket in the window (brute-force nodes).
			const inWindow = (ns: ReturnType<typeof bruteNodes>) =>
				ns.filter((n, k) => (ns[k + 1]?.first ?? Infinity) > from && n.first <= to).length;
			let span = FANOUT;
			let nodes = bruteNodes(time, value, span);
			while (nodes.length > 1) {
				const coarser = bruteNodes(time, value, span * FANOUT);
				if (inWindow(coarser) < 2 * buckets) break;
				span *= FANOUT;
				nodes = coarser;
			}
			const want = new Map<number, { min: number; max: number }>();
			for (const n of nodes)
				for (const [t, v] of [n.min, n.max]) {
					if (t < from || t > to) continue;
					const b = bucketOf(t, from, to, buckets);
					const w = want.get(b) ?? { min: Infinity, max: -Infinity };
					want.set(b, { min: Math.min(w.min, v), max: Math.max(w.max, v) });
				}
			const got = new Map<number, number[]>();
			d.time.forEach((t, k) => {
				if (t < from || t > to) return;
				const b = bucketOf(t, from, to, buckets);
				got.set(b, [...(got.get(b) ?? []), d.value[k]]);
			});
			expect([...got.keys()].sort((a, b) => a - b)).toEqual([...want.keys()].sort((a, b) => a - b));
			for (const [b, w] of want) {
				expect(Math.min(...got.get(b)!)).toBe(w.min);
				expect(Math.max(...got.get(b)!)).toBe(w.max);
			}
			// The window's true extremes are within one node of the edges: every sample of a node wholly
			// inside the window is bounded by what was returned.
			const inner = [...Array(time.length).keys()].filter((i) => {
				const a = Math.floor(i / span) * span;
				const b = Math.min(time.length, a + span) - 1;
				return (
					time[a] >= from && time[b] <= to && (nodes[a / span + 1]?.first ?? Infinity) > time[b]
				);
			});
			if (inner.length) {
				const returned = Array.from(d.value).filter((_, k) => d.time[k] >= from && d.time[k] <= to);
				expect(Math.min(...returned)).toBeLessThanOrEqual(
					inner.reduce((m, i) => Math.min(m, value[i]), Infinity)
				);
				expect(Math.max(...returned)).toBeGreaterThanOrEqual(
					inner.reduce((m, i) => Math.max(m, value[i]), -Infinity)
				);
			}
			// Samples counted to within one node at each edge.
			const exact = Array.from(time).filter((t) => t >= from && t <= to).length;
			expect(Math.abs(d.inRange - exact)).toBeLessThanOrEqual(2 * span);
			expect(samplesAround(pyramid, from, to)).toBeGreaterThanOrEqual(exact);
		}
	);

	it('answers an empty channel with nothing', () => {
		const empty = new PyramidBuilder().finish();
		expect(queryPyramid(empty, 0, 1, 10).time.length).toBe(0);
		expect(pyramidFromBytes(pyramidToBytes(empty))).toEqual(empty);
	});
});
