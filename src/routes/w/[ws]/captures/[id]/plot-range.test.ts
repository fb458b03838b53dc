import { describe, expect, it } from 'vitest';
import {
	clampRange,
	MAX_POINTS,
	panRange,
	pointsForWidth,
	unionBounds,
	valueExtent,
	visibleMarkerSpans,
	zoomRange
} from './plot-range';

const bounds = { from: 0, to: 100 };

describe('zoomRange', () => {
	// Arithmetic of an anchored zoom: the anchor keeps its fraction of the window, the width scales by the factor.
	it.each([
		{ range: { from: 20, to: 60 }, factor: 0.5, anchor: 30 },
		{ range: { from: 20, to: 60 }, factor: 0.25, anchor: 55 },
		{ range: { from: 10, to: 30 }, factor: 2, anchor: 20 }
	])(
		'keeps the anchor $anchor in place when zooming $range by $factor',
		({ range, factor, anchor }) => {
			const next = zoomRange(range, factor, bounds, anchor);
			expect(next.to - next.from).toBeCloseTo((range.to - range.from) * factor, 12);
			const before = (anchor - range.from) / (range.to - range.from);
			const after = (anchor - next.from) / (next.to - next.from);
			expect(after).toBeCloseTo(before, 12);
		}
	);

	it('never zooms out past the capture and never below the minimum span', () => {
		expect(zoomRange({ from: 40, to: 60 }, 100, bounds)).toEqual(bounds);
		const tiny = zoomRange({ from: 50, to: 50.000001 }, 1e-6, bounds);
		expect(tiny.to - tiny.from).toBeGreaterThanOrEqual(1e-6 - 1e-12);
	});
});

describe('panRange / clampRange', () => {
	it('moves by a fraction of the width and stops at either end, keeping the width', () => {
		expect(panRange({ from: 20, to: 40 }, 0.5, bounds)).toEqual({ from: 30, to: 50 });
		expect(panRange({ from: 80, to: 95 }, 1, bounds)).toEqual({ from: 85, to: 100 });
		expect(panRange({ from: 5, to: 25 }, -1, bounds)).toEqual({ from: 0, to: 20 });
	});

	it('returns the bounds for a window wider than the capture', () => {
		expect(clampRange({ from: -10, to: 200 }, bounds)).toEqual(bounds);
	});
});

describe('pointsForWidth', () => {
	it('asks for one bucket per device pixel, within the API limit of 10000', () => {
		expect(pointsForWidth(800)).toBe(800);
		expect(pointsForWidth(800, 2)).toBe(1600);
		expect(pointsForWidth(20_000)).toBe(MAX_POINTS);
		expect(pointsForWidth(0)).toBe(2);
	});
});

describe('visibleMarkerSpans', () => {
	const markers = [
		{ time: 1, endTime: 3, label: 'a', severity: 'advisory' as const },
		{ time: 8, endTime: null, label: 'b', severity: 'critical' as const },
		{ time: 20, endTime: 30, label: 'c', severity: 'advisory' as const }
	];
	it('clips spans to the window, runs open spans to its right edge and drops those outside', () => {
		const spans = visibleMarkerSpans(markers, { from: 2, to: 10 });
		expect(spans.map((s) => [s.label, s.from, s.to])).toEqual([
			['a', 2, 3],
			['b', 8, 10]
		]);
	});
});

describe('unionBounds / valueExtent', () => {
	it('joins spans and skips empty ones', () => {
		expect(unionBounds([null, { from: 2, to: 5 }, { from: 1, to: 3 }])).toEqual({ from: 1, to: 5 });
		expect(unionBounds([null])).toBeNull();
	});
	it('ignores NaN and infinities, which JSON sends as null for float signals', () => {
		expect(valueExtent([3, NaN, null, -2, Infinity, 7])).toEqual({ min: -2, max: 7 });
		expect(valueExtent([])).toBeNull();
	});
});
