// Node-only: reads the theme colours from src/app.css so the check follows the stylesheet.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { PLOT_COLOURS, seriesStyle } from './plot-palette';

type Rgb = [number, number, number];

const hexToRgb = (hex: string): Rgb =>
	[1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)) as Rgb;

// sRGB → linear light, IEC 61966-2-1 transfer function (as quoted by WCAG 2.1's definition of
// relative luminance).
const toLinear = (c: number) => {
	const s = c / 255;
	return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
};
const linear = (hex: string): Rgb => hexToRgb(hex).map(toLinear) as Rgb;

/** WCAG 2.1 relative luminance and contrast ratio (definitions in WCAG 2.1, "relative luminance", "contrast ratio"). */
const luminance = ([r, g, b]: Rgb) => 0.2126 * r + 0.7152 * g + 0.0722 * b;
const contrast = (a: number, b: number) => (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);

// Machado, Oliveira & Fernandes (2009), "A Physiologically-based Model for Simulation of Color
// Vision Deficiency", IEEE TVCG 15(6): the severity 1.0 matrices for linear RGB (from memory).
const MACHADO_2009: Record<string, number[]> = {
	protanopia: [
		0.152286, 1.052583, -0.204868, 0.114503, 0.786281, 0.099216, -0.003882, -0.048116, 1.051998
	],
	deuteranopia: [
		0.367322, 0.860646, -0.227968, 0.280085, 0.672501, 0.047413, -0.01182, 0.04294, 0.968881
	],
	tritanopia: [
		1.255528, -0.076749, -0.178779, -0.078411, 0.930809, 0.147602, 0.004733, 0.691367, 0.3039
	]
};

const clamp = (x: number) => Math.min(1, Math.max(0, x));
const simulate = (m: number[], [r, g, b]: Rgb): Rgb => [
	clamp(m[0] * r + m[1] * g + m[2] * b),
	clamp(m[3] * r + m[4] * g + m[5] * b),
	clamp(m[6] * r + m[7] * g + m[8] * b)
];

/** Linear sRGB → CIELAB (D65), via XYZ with the sRGB primaries (IEC 61966-2-1) and CIE 1976 L*a*b*. */
function lab([r, g, b]: Rgb): Rgb {
	const x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
	const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
	const z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
	const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
	return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
}
/** CIE 1976 colour difference ΔE*ab. */
const deltaE = (a: Rgb, b: Rgb) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

function themeSurface(theme: 'light' | 'dark'): string {
	const css = readFileSync(new URL('../app.css', import.meta.url), 'utf8');
	const surfaces = [...css.matchAll(/--color-surface:\s*(#[0-9a-fA-F]{6})/g)].map((m) => m[1]);
	expect(surfaces.length).toBeGreaterThanOrEqual(2); // light first, then the dark theme's
	return theme === 'light' ? surfaces[0] : surfaces[1];
}

describe('the plot palette', () => {
	it.each(['light', 'dark'] as const)(
		'every colour has at least 3:1 contrast against the %s plot background (WCAG 2.1 SC 1.4.11)',
		(theme) => {
			const background = luminance(linear(themeSurface(theme)));
			for (const colour of PLOT_COLOURS)
				expect(contrast(luminance(linear(colour)), background), colour).toBeGreaterThanOrEqual(3);
		}
	);

	it.each(['normal', ...Object.keys(MACHADO_2009)])(
		'any two colours differ by ΔE*ab ≥ 20 in %s vision (Machado et al. 2009 simulation)',
		(vision) => {
			const seen = PLOT_COLOURS.map((hex) => {
				const rgb = linear(hex);
				return lab(vision === 'normal' ? rgb : simulate(MACHADO_2009[vision], rgb));
			});
			let closest = Infinity;
			for (let i = 0; i < seen.length; i++)
				for (let j = i + 1; j < seen.length; j++)
					closest = Math.min(closest, deltaE(seen[i], seen[j]));
			expect(closest).toBeGreaterThanOrEqual(20);
		}
	);

	it('the simulation is sane: it leaves grey grey and merges red with green for protanopia', () => {
		const grey: Rgb = [0.2, 0.2, 0.2];
		for (const m of Object.values(MACHADO_2009))
			for (const [a, b] of simulate(m, grey).map((v, i) => [v, grey[i]]))
				expect(a).toBeCloseTo(b, 2);
		// Pure red and a green of the same simulated luminance look much closer to a protanope.
		const red = linear('#ff0000');
		const olive = linear('#808000');
		const normal = deltaE(lab(red), lab(olive));
		const protan = deltaE(
			lab(simulate(MACHADO_2009.protanopia, red)),
			lab(simulate(MACHADO_2009.protanopia, olive))
		);
		expect(protan).toBeLessThan(normal / 2);
	});

	it('repeats the colours with a dash pattern after six channels', () => {
		expect(seriesStyle(0)).toEqual({ colour: PLOT_COLOURS[0], dash: [], pattern: 'solid' });
		expect(seriesStyle(6).colour).toBe(PLOT_COLOURS[0]);
		expect(seriesStyle(6).pattern).toBe('dashed');
		const styles = Array.from({ length: 24 }, (_, k) => seriesStyle(k));
		expect(new Set(styles.map((s) => `${s.colour}/${s.pattern}`)).size).toBe(24);
	});
});
