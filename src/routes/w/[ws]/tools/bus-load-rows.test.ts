import { describe, expect, it } from 'vitest';
import { mapBusLoad } from '$lib/can/busload';
import { canMapSchema, type CanMap } from '$lib/can/map';
import { budgetSchema, busLoadRows } from './bus-load-rows';

const map: CanMap = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Two-frame demo',
	bitrate: 500_000,
	frames: [
		{ name: 'Slow', id: 0x100, length: 8, cycleMs: 100 },
		{ name: 'Fast', id: 0x18fef100, extended: true, length: 8, cycleMs: 10 },
		{ name: 'OnChange', id: 0x200, length: 2, cycleMs: null },
		{ name: 'FdBlock', id: 0x300, length: 64, cycleMs: 10 }
	]
});
const response = {
	map: { id: 'm', name: map.name },
	label: 'r1',
	busLoad: mapBusLoad(map),
	frames: map.frames.map((f) => ({ extended: f.extended, length: f.length, cycleMs: f.cycleMs }))
};

describe('busLoadRows', () => {
	it('lists counted frames heaviest first with their hex IDs, and the rest apart with the reason', () => {
		const { counted, uncounted } = busLoadRows(response);
		expect(counted.map((r) => [r.name, r.idText, r.cycleMs])).toEqual([
			['FdBlock', '0x300', 10],
			['Fast', '0x18FEF100', 10],
			['Slow', '0x100', 100]
		]);
		// ISO 11898-1 frame length without stuffing: 64 + 8n bits extended, plus 3 bits intermission.
		expect(counted[1].nominalBitsPerSecond).toBeCloseTo(100 * (64 + 64 + 3), 9);
		// CAN FD, 64 bytes, base format (ISO 11898-1:2015): 569 bits + 7 fixed stuff bits + 3 intermission.
		expect(counted[0].nominalBitsPerSecond).toBeCloseTo(100 * (569 + 7 + 3), 9);
		expect(uncounted.map((r) => [r.name, r.reason])).toEqual([
			['OnChange', expect.stringMatching(/no cycle time/)]
		]);
	});
});

describe('budgetSchema', () => {
	it.each([
		['50', 50],
		[' 37.5 ', 37.5]
	])('accepts %s', (text, value) => {
		expect(budgetSchema.parse(text)).toBe(value);
	});
	it.each([
		['', /plain number/],
		['0', /more than 0/],
		['120', /100 %/],
		['50%', /plain number/]
	])('refuses %s', (text, message) => {
		const result = budgetSchema.safeParse(text);
		expect(result.success).toBe(false);
		expect(result.error?.issues[0].message).toMatch(message);
	});
});
