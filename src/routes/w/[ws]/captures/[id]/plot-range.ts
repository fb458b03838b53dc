/**
 * The time window a capture plot shows, and how zoom and pan move it. Kept apart from the canvas so
 * the arithmetic (anchor stays put while zooming, window never leaves the capture) is testable.
 */

export interface TimeRange {
	from: number;
	to: number;
}

/** The narrowest window we zoom to: below a microsecond no CAN frame is resolved anyway. */
export const MIN_SPAN_SECONDS = 1e-6;

/** The decimation API answers at most this many buckets (K2's series route, points ≤ 10000). */
export const MAX_POINTS = 10_000;

/** Pulls a window back inside the bounds, keeping its width when it fits. */
export function clampRange(
	range: TimeRange,
	bounds: TimeRange,
	minSpan = MIN_SPAN_SECONDS
): TimeRange {
	const boundSpan = bounds.to - bounds.from;
	const span = Math.max(range.to - range.from, Math.min(minSpan, boundSpan));
	if (!(span < boundSpan)) return { ...bounds };
	let from = range.from;
	if (from < bounds.from) from = bounds.from;
	if (from + span > bounds.to) from = bounds.to - span;
	return { from, to: from + span };
}

/**
 * Zooms by `factor` (< 1 zooms in, > 1 out) around the time `anchor`, which keeps its place on
 * screen — the behaviour people expect from a wheel or pinch at the cursor.
 */
export function zoomRange(
	range: TimeRange,
	factor: number,
	bounds: TimeRange,
	anchor = (range.from + range.to) / 2
): TimeRange {
	const from = anchor - (anchor - range.from) * factor;
	const to = anchor + (range.to - anchor) * factor;
	return clampRange({ from, to }, bounds);
}

/** Moves the window by a fraction of its width (negative = earlier), stopping at the ends. */
export function panRange(range: TimeRange, fraction: number, bounds: TimeRange): TimeRange {
	const shift = (range.to - range.from) * fraction;
	return clampRange({ from: range.from + shift, to: range.to + shift }, bounds);
}

/** Buckets to ask for: one per device pixel column across the plot, within the API's limit. */
export function pointsForWidth(cssWidth: number, devicePixelRatio = 1): number {
	const px = Math.round(cssWidth * Math.max(1, devicePixelRatio));
	return Math.min(MAX_POINTS, Math.max(2, px));
}

export function sameRange(a: TimeRange, b: TimeRange, tolerance = 1e-12): boolean {
	const scale = Math.max(1, Math.abs(a.from), Math.abs(a.to));
	return (
		Math.abs(a.from - b.from) <= tolerance * scale && Math.abs(a.to - b.to) <= tolerance * scale
	);
}

/** Union of the time spans of several series, or null when none has a sample. */
export function unionBounds(spans: readonly (TimeRange | null)[]): TimeRange | null {
	let from = Infinity;
	let to = -Infinity;
	for (const s of spans) {
		if (!s) continue;
		if (s.from < from) from = s.from;
		if (s.to > to) to = s.to;
	}
	return from <= to ? { from, to } : null;
}

export interface PlotMarker {
	time: number;
	endTime: number | null;
	label: string;
	severity: 'advisory' | 'critical';
}

/**
 * The part of each marker inside the visible window; a marker still active at the end of the
 * capture (endTime null) runs to the window's right edge. Markers wholly outside are dropped.
 */
export function visibleMarkerSpans(
	markers: readonly PlotMarker[],
	range: TimeRange
): (PlotMarker & { from: number; to: number })[] {
	const out: (PlotMarker & { from: number; to: number })[] = [];
	for (const m of markers) {
		const end = m.endTime ?? range.to;
		if (end < range.from || m.time > range.to) continue;
		out.push({ ...m, from: Math.max(m.time, range.from), to: Math.min(end, range.to) });
	}
	return out;
}

/** Smallest and largest finite value of a fetched series, for the screen-reader summary. */
export function valueExtent(values: ArrayLike<number | null>): { min: number; max: number } | null {
	let min = Infinity;
	let max = -Infinity;
	for (let i = 0; i < values.length; i++) {
		const v = values[i];
		if (v === null || !Number.isFinite(v)) continue;
		if (v < min) min = v;
		if (v > max) max = v;
	}
	return min <= max ? { min, max } : null;
}
