/**
 * The bit-activity grid of an unknown ID: for each payload bit, how often it changed between
 * consecutive frames, as a fraction of the chances it had. Constant bits (0 %) are padding or
 * flags that never moved; a bit that flips every frame (100 %) is typically the lowest bit of a
 * counter, the next one up flips half as often — the pattern that gives a counter away.
 */

export interface ActivityCell {
	/** Payload bit number, docs/bit-numbering.md: bit `bitInByte` of byte `byte`. */
	bit: number;
	byte: number;
	bitInByte: number;
	changes: number;
	/** changes / (frames − 1); 0 when there were fewer than two frames. */
	fraction: number;
	/** Shade step 0 (never changed) … SHADE_STEPS (changed on every frame). */
	shade: number;
}

export interface ActivityRow {
	byte: number;
	/** Bits 7 … 0, left to right, as in the map editor's bit grid. */
	cells: ActivityCell[];
}

export const SHADE_STEPS = 5;

/** Shade step of a change fraction: 0 only for a bit that never changed, so any activity shows. */
export function shadeOf(fraction: number): number {
	if (!(fraction > 0)) return 0;
	return Math.min(SHADE_STEPS, Math.max(1, Math.ceil(fraction * SHADE_STEPS)));
}

export function bitActivity(
	bitChanges: readonly number[],
	maxLength: number,
	frameCount: number
): ActivityRow[] {
	const chances = Math.max(0, frameCount - 1);
	const rows: ActivityRow[] = [];
	for (let byte = 0; byte < maxLength; byte++) {
		const cells: ActivityCell[] = [];
		for (let bitInByte = 7; bitInByte >= 0; bitInByte--) {
			const bit = byte * 8 + bitInByte;
			const changes = bitChanges[bit] ?? 0;
			const fraction = chances > 0 ? Math.min(1, changes / chances) : 0;
			cells.push({ bit, byte, bitInByte, changes, fraction, shade: shadeOf(fraction) });
		}
		rows.push({ byte, cells });
	}
	return rows;
}

/** The payload bits that changed at all, most active first — the short list a person reads first. */
export function busiestBits(bitChanges: readonly number[], limit = 3): number[] {
	return bitChanges
		.map((changes, bit) => ({ bit, changes }))
		.filter((b) => b.changes > 0)
		.sort((a, b) => b.changes - a.changes || a.bit - b.bit)
		.slice(0, limit)
		.map((b) => b.bit);
}

export function formatPercent(fraction: number): string {
	const pct = fraction * 100;
	if (pct === 0 || pct === 100) return `${pct} %`;
	return `${pct < 1 ? pct.toPrecision(1) : pct.toFixed(1)} %`;
}
