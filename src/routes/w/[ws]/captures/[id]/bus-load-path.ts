/**
 * The bus-load chart as plain SVG geometry: a polyline of percent over time, scaled into a box,
 * with a y-axis top rounded up to a tidy step so the peak never touches the frame.
 */

export interface LoadPoint {
	start: number;
	percent: number;
}

/** Axis top: the next multiple of 10 % above the peak, at least 10 % and at most 100 %. */
export function loadAxisTop(peakPercent: number): number {
	if (!(peakPercent > 0)) return 10;
	let top = Math.ceil(peakPercent / 10) * 10;
	if (top === peakPercent) top += 10; // a peak exactly on a step would sit on the frame
	return Math.min(100, Math.max(10, top));
}

export interface LoadSummary {
	meanPercent: number;
	peakPercent: number;
	peakTime: number | null;
}

export function summarizeLoad(points: readonly LoadPoint[]): LoadSummary {
	let total = 0;
	let peakPercent = 0;
	let peakTime: number | null = null;
	for (const p of points) {
		total += p.percent;
		if (peakTime === null || p.percent > peakPercent) {
			peakPercent = p.percent;
			peakTime = p.start;
		}
	}
	return { meanPercent: points.length ? total / points.length : 0, peakPercent, peakTime };
}

/**
 * SVG `points` attribute for the line, x across [0, width], y down from `height` (0 %) to 0
 * (`yTop` %). Values above yTop are drawn at the top edge.
 */
export function loadPolyline(
	points: readonly LoadPoint[],
	width: number,
	height: number,
	yTop: number
): string {
	if (points.length === 0) return '';
	const t0 = points[0].start;
	const span = points[points.length - 1].start - t0;
	return points
		.map((p, i) => {
			const x =
				span > 0
					? ((p.start - t0) / span) * width
					: points.length > 1
						? (i / (points.length - 1)) * width
						: width / 2;
			const y = height - (Math.min(p.percent, yTop) / yTop) * height;
			return `${round(x)},${round(y)}`;
		})
		.join(' ');
}

const round = (v: number) => Math.round(v * 100) / 100;
