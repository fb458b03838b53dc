/** Drawing the XY and histogram figures of the workbench as SVG: pure arithmetic, tested. */

export interface Extent {
	min: number;
	max: number;
}

function extentOf(values: readonly number[]): Extent {
	let min = Infinity;
	let max = -Infinity;
	for (const v of values) {
		if (v < min) min = v;
		if (v > max) max = v;
	}
	if (!(min <= max)) return { min: 0, max: 1 };
	// A constant gets a unit-wide extent around it, so it is drawn in the middle.
	return min === max ? { min: min - 0.5, max: max + 0.5 } : { min, max };
}

/**
 * One SVG path of 2 × 2 squares, one per pair, in a width × height box (y grows upwards in value,
 * downwards on screen). A single path keeps thousands of points cheap to draw.
 */
export function scatterPath(
	x: readonly number[],
	y: readonly number[],
	width: number,
	height: number
): { path: string; x: Extent; y: Extent } {
	const ex = extentOf(x);
	const ey = extentOf(y);
	const parts: string[] = [];
	for (let i = 0; i < x.length; i++) {
		const px = ((x[i] - ex.min) / (ex.max - ex.min)) * width;
		const py = height - ((y[i] - ey.min) / (ey.max - ey.min)) * height;
		parts.push(`M${(px - 1).toFixed(1)} ${(py - 1).toFixed(1)}h2v2h-2z`);
	}
	return { path: parts.join(''), x: ex, y: ey };
}

/** Bars side by side across the width, heights relative to the fullest bin. */
export function histogramBars(
	counts: readonly number[],
	width: number,
	height: number
): { x: number; y: number; width: number; height: number }[] {
	const top = Math.max(1, ...counts);
	const w = width / Math.max(1, counts.length);
	return counts.map((count, i) => {
		const h = (count / top) * height;
		return { x: i * w, y: height - h, width: w, height: h };
	});
}
