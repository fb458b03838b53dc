/**
 * Colours of plotted channels. One palette serves both themes: every colour has a relative
 * luminance between the two plot backgrounds' thresholds, so it reaches 3:1 contrast against the
 * light surface and the dark one (WCAG 2.1 SC 1.4.11, non-text contrast), and the colours stay
 * apart for people with protanopia, deuteranopia or tritanopia (checked in plot-palette.test.ts
 * with the Machado, Oliveira & Fernandes 2009 simulation). Past six channels on one axis the
 * colours repeat with a dash pattern, so a line is never told apart by colour alone.
 */
export const PLOT_COLOURS = [
	'#0099aa',
	'#ee0000',
	'#9922ff',
	'#cc7766',
	'#cc1177',
	'#8877ee'
] as const;

/** Dash patterns (canvas setLineDash, CSS px) for each round through the colours. */
export const PLOT_DASHES: readonly (readonly number[])[] = [[], [6, 3], [2, 3], [8, 3, 2, 3]];

export interface SeriesStyle {
	colour: string;
	dash: number[];
	/** How the dash pattern is described to people (legends, screen readers). */
	pattern: 'solid' | 'dashed' | 'dotted' | 'dash-dot';
}

const PATTERNS = ['solid', 'dashed', 'dotted', 'dash-dot'] as const;

/** The style of the k-th channel on an axis (k from 0). */
export function seriesStyle(k: number): SeriesStyle {
	const round = Math.floor(k / PLOT_COLOURS.length) % PLOT_DASHES.length;
	return {
		colour: PLOT_COLOURS[k % PLOT_COLOURS.length],
		dash: [...PLOT_DASHES[round]],
		pattern: PATTERNS[round]
	};
}
