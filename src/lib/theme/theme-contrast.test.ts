import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { contrastRatio, relativeLuminance } from './contrast';

describe('contrastRatio (WCAG 2.1 definitions)', () => {
	// WCAG 2.1 "contrast ratio": ratios range from 1:1 to 21:1 (black on white).
	it('gives 21 for black on white and 1 for a colour on itself', () => {
		expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 10);
		expect(contrastRatio('#ffffff', '#000000')).toBeCloseTo(21, 10);
		expect(contrastRatio('#a8481a', '#a8481a')).toBe(1);
	});
	// #767676 on white is the widely quoted lightest grey that passes AA at 4.54:1 (from memory).
	it('gives about 4.54 for #767676 on white', () => {
		expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
	});
	// sRGB primaries: luminance equals the WCAG channel coefficient (WCAG 2.1 relative luminance).
	it.each([
		['#ff0000', 0.2126],
		['#00ff00', 0.7152],
		['#0000ff', 0.0722]
	])('luminance of %s is %f', (hex, l) => {
		expect(relativeLuminance(hex)).toBeCloseTo(l, 10);
	});
	it('rejects colours it cannot read', () => {
		expect(() => relativeLuminance('red')).toThrow(/#1a2b3c/);
	});
});

/** Reads the `--color-*` tokens of one CSS block (the @theme block or the dark override). */
function tokensOf(css: string, blockStart: string): Record<string, string> {
	const from = css.indexOf(blockStart);
	if (from < 0) throw new Error(`block ${blockStart} not found in app.css`);
	const body = css.slice(from, css.indexOf('}', from));
	const tokens: Record<string, string> = {};
	for (const m of body.matchAll(/--color-([a-z-]+):\s*(#[0-9a-f]{6})/gi)) tokens[m[1]] = m[2];
	return tokens;
}

const css = readFileSync(new URL('../../app.css', import.meta.url), 'utf8');
const themes = {
	light: tokensOf(css, '@theme {'),
	dark: tokensOf(css, ':root.dark {')
};

// WCAG 2.1 SC 1.4.3: 4.5:1 for normal text; SC 1.4.11: 3:1 for focus rings and control borders.
const textPairs: [fg: string, bg: string][] = [
	['ink', 'canvas'],
	['ink', 'surface'],
	['ink', 'sunken'],
	['ink-muted', 'canvas'],
	['ink-muted', 'surface'],
	['ink-muted', 'sunken'],
	['accent', 'canvas'],
	['accent', 'surface'],
	['accent', 'accent-soft'],
	['on-accent', 'accent'],
	['on-accent', 'accent-strong'],
	['danger', 'surface'],
	['danger', 'danger-soft'],
	['ok', 'surface'],
	['ok', 'ok-soft'],
	['caution', 'caution-soft']
];
const nonTextPairs: [fg: string, bg: string][] = [
	['accent', 'canvas'],
	['accent', 'surface'],
	['line-strong', 'surface']
];

describe.each(Object.entries(themes))('%s theme tokens', (_name, tokens) => {
	it('defines the same token names as the other theme', () => {
		expect(Object.keys(tokens).sort()).toEqual(Object.keys(themes.light).sort());
	});
	it.each(textPairs)('text %s on %s reaches 4.5:1', (fg, bg) => {
		expect(contrastRatio(tokens[fg], tokens[bg])).toBeGreaterThanOrEqual(4.5);
	});
	it.each(nonTextPairs)('%s against %s reaches 3:1', (fg, bg) => {
		expect(contrastRatio(tokens[fg], tokens[bg])).toBeGreaterThanOrEqual(3);
	});
});
