/**
 * WCAG 2.x contrast ratio between two sRGB colours given as #rrggbb.
 * Formulas from WCAG 2.1, "relative luminance" and "contrast ratio" definitions.
 */
export function relativeLuminance(hex: string): number {
	const match = /^#([0-9a-f]{6})$/i.exec(hex.trim());
	if (!match) throw new Error(`Expected a colour like #1a2b3c, got "${hex}"`);
	const n = parseInt(match[1], 16);
	const [r, g, b] = [(n >> 16) & 0xff, (n >> 8) & 0xff, n & 0xff].map((c) => {
		const s = c / 255;
		// WCAG 2.1 uses 0.03928 here; later sRGB texts use 0.04045 — no 8-bit value lies between them.
		return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
	});
	return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

export function contrastRatio(a: string, b: string): number {
	const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
	return (hi + 0.05) / (lo + 0.05);
}
