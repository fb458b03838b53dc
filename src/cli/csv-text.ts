/** Text helpers for CSV output. */

/** Quotes a field only when it needs it (RFC 4180: comma, quote or line break). */
export function csvField(text: string): string {
	return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * A physical value as short decimal text: 12 significant digits drop binary noise such as
 * 0.30000000000000004 (a float64 carries 15–17) while keeping every digit a scale can produce.
 */
export function formatValue(value: number): string {
	return Number.isInteger(value) ? String(value) : String(Number(value.toPrecision(12)));
}
