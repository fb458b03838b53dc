import { describe, expect, it } from 'vitest';
import { bitActivity, busiestBits, formatPercent, shadeOf, SHADE_STEPS } from './bit-activity';

/** Reference for the numbering of docs/bit-numbering.md: payload bit b is bit b of the payload read as a little-endian integer (BigInt via DataView). */
function payloadWithBit(bit: number): Uint8Array {
	const bytes = new Uint8Array(8);
	new DataView(bytes.buffer).setBigUint64(0, 1n << BigInt(bit), true);
	return bytes;
}

/** Reference change counts: XOR of consecutive payloads as BigInts, bit by bit. */
function referenceChanges(payloads: Uint8Array[], length: number): number[] {
	const changes = new Array<number>(length * 8).fill(0);
	for (let i = 1; i < payloads.length; i++) {
		const a = new DataView(payloads[i - 1].buffer).getBigUint64(0, true);
		const b = new DataView(payloads[i].buffer).getBigUint64(0, true);
		const x = a ^ b;
		for (let bit = 0; bit < length * 8; bit++) if ((x >> BigInt(bit)) & 1n) changes[bit]++;
	}
	return changes;
}

describe('bitActivity', () => {
	it('puts payload bit b at byte ⌊b/8⌋, bit b % 8, where a little-endian DataView write puts it (docs/bit-numbering.md)', () => {
		for (let bit = 0; bit < 64; bit++) {
			const changes = new Array<number>(64).fill(0);
			changes[bit] = 1;
			const cell = bitActivity(changes, 8, 2)
				.flatMap((r) => r.cells)
				.find((c) => c.changes === 1)!;
			const bytes = payloadWithBit(bit);
			expect(bytes[cell.byte]).toBe(1 << cell.bitInByte);
			expect(cell.bit).toBe(bit);
		}
	});

	it('lays out bytes as rows with bits 7…0 left to right, like the map editor grid', () => {
		const rows = bitActivity(new Array(16).fill(0), 2, 10);
		expect(rows.map((r) => r.byte)).toEqual([0, 1]);
		expect(rows[1].cells.map((c) => c.bit)).toEqual([15, 14, 13, 12, 11, 10, 9, 8]);
	});

	it('shows a binary counter in byte 2: bit k changes on ⌊N/2^k⌋ of N increments (arithmetic of binary counting)', () => {
		const frames = 256;
		const payloads = Array.from({ length: frames }, (_, n) => {
			const bytes = new Uint8Array(8);
			bytes[2] = n;
			bytes[5] = 0x5a; // constant
			return bytes;
		});
		const rows = bitActivity(referenceChanges(payloads, 8), 8, frames);
		const byte2 = rows[2].cells;
		for (const cell of byte2) {
			expect(cell.fraction).toBeCloseTo(Math.floor(255 / 2 ** cell.bitInByte) / 255, 12);
		}
		expect(byte2.find((c) => c.bitInByte === 0)!.shade).toBe(SHADE_STEPS);
		expect(rows[5].cells.every((c) => c.changes === 0 && c.shade === 0)).toBe(true);
	});

	it('gives zero fractions for a single frame (no chance to change)', () => {
		expect(
			bitActivity([3, 0, 0, 0, 0, 0, 0, 0], 1, 1)[0].cells.every((c) => c.fraction === 0)
		).toBe(true);
	});
});

describe('shadeOf / busiestBits / formatPercent', () => {
	it('keeps step 0 for bits that never changed and gives any change at least step 1', () => {
		expect(shadeOf(0)).toBe(0);
		expect(shadeOf(1e-6)).toBe(1);
		expect(shadeOf(0.5)).toBe(Math.ceil(SHADE_STEPS / 2));
		expect(shadeOf(1)).toBe(SHADE_STEPS);
	});
	it('ranks changing bits, most active first', () => {
		expect(busiestBits([0, 5, 0, 9, 5], 3)).toEqual([3, 1, 4]);
	});
	it('formats fractions as percent', () => {
		expect(formatPercent(1)).toBe('100 %');
		expect(formatPercent(0.4980392)).toBe('49.8 %');
		expect(formatPercent(0.004)).toBe('0.4 %');
	});
});
