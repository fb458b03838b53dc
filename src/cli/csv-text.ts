/** Text helpers for CSV output (cells themselves: src/lib/can/csv-cell.ts). */

/**
 * A physical value as short decimal text: 12 significant digits drop binary noise such as
 * 0.30000000000000004 (a float64 carries 15–17) while keeping every digit a scale can produce.
 */
export function formatValue(value: number): string {
	return Number.isInteger(value) ? String(value) : String(Number(value.toPrecision(12)));
}
