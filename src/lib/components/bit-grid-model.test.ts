import { describe, expect, it } from 'vitest';
import { fieldBitPositions } from '$lib/can/bits';
import { signalSchema, type ByteOrder, type SignalInput } from '$lib/can/map';
import { seededRandom } from '$lib/can/testing/seeded-random';
import {
	abbreviate,
	buildBitGrid,
	dragToField,
	nudgeField,
	signalHues,
	type GridCell
} from './bit-grid-model';

const signal = (input: Partial<SignalInput> & Pick<SignalInput, 'name' | 'startBit' | 'length'>) =>
	signalSchema.parse(input);

function cellAt(model: ReturnType<typeof buildBitGrid>, bit: number): GridCell {
	for (const row of model.rows) for (const cell of row.cells) if (cell.bit === bit) return cell;
	throw new Error(`no cell for bit ${bit}`);
}

/** Payload bits a signal owns in the grid, in value-bit order (LSB first). */
function ownedBits(model: ReturnType<typeof buildBitGrid>, index: number): number[] {
	const owned: { bit: number; valueBit: number }[] = [];
	for (const row of model.rows)
		for (const cell of row.cells)
			for (const o of cell.owners)
				if (o.signal === index) owned.push({ bit: cell.bit, valueBit: o.valueBit });
	return owned.sort((a, b) => a.valueBit - b.valueBit).map((o) => o.bit);
}

describe('buildBitGrid', () => {
	it('lays out rows = bytes 0…n−1 and columns = bits 7…0 (docs/bit-numbering.md: payload bit b is bit b % 8 of byte ⌊b/8⌋)', () => {
		const model = buildBitGrid({ length: 2, signals: [] });
		expect(model.rows.map((r) => r.byte)).toEqual([0, 1]);
		expect(model.rows[1].cells.map((c) => c.bit)).toEqual([15, 14, 13, 12, 11, 10, 9, 8]);
		expect(model.rows[1].cells.map((c) => c.bitInByte)).toEqual([7, 6, 5, 4, 3, 2, 1, 0]);
	});

	it('little-endian: value bit i sits on payload bit startBit + i (docs/bit-numbering.md), LSB marked at startBit', () => {
		const model = buildBitGrid({
			length: 8,
			signals: [signal({ name: 'Rpm', startBit: 4, length: 12 })]
		});
		expect(ownedBits(model, 0)).toEqual(Array.from({ length: 12 }, (_, i) => 4 + i));
		expect(cellAt(model, 4).owners[0]).toMatchObject({ lsb: true, valueBit: 0 });
		expect(cellAt(model, 15).owners[0]).toMatchObject({ msb: true, valueBit: 11, continues: null });
		// After bit 7 of byte 0 the field continues in the following byte.
		expect(cellAt(model, 7).owners[0].continues).toBe('next-byte');
	});

	it('big-endian: the docs/bit-numbering.md example (startBit 8, length 16) fills bytes 0–1 and continues into the byte before', () => {
		const model = buildBitGrid({
			length: 8,
			signals: [signal({ name: 'Boost', startBit: 8, length: 16, byteOrder: 'big' })]
		});
		// docs/bit-numbering.md: a big-endian field filling bytes k … k+m−1 has startBit = 8·(k+m−1); here k = 0, m = 2.
		expect(ownedBits(model, 0)).toEqual([8, 9, 10, 11, 12, 13, 14, 15, 0, 1, 2, 3, 4, 5, 6, 7]);
		expect(cellAt(model, 8).owners[0].lsb).toBe(true);
		expect(cellAt(model, 15).owners[0].continues).toBe('previous-byte');
		expect(cellAt(model, 7).owners[0].msb).toBe(true);
	});

	it('matches fieldBitPositions from the core library for random fields in both byte orders', () => {
		const random = seededRandom(4242).next;
		for (let n = 0; n < 300; n++) {
			const byteOrder: ByteOrder = random() < 0.5 ? 'little' : 'big';
			const length = 1 + Math.floor(random() * 64);
			const startBit = Math.floor(random() * 128);
			const model = buildBitGrid({
				length: 8,
				signals: [signal({ name: 'X', startBit, length, byteOrder })]
			});
			expect(ownedBits(model, 0)).toEqual(fieldBitPositions(startBit, length, byteOrder));
		}
	});

	it('flags overlapping bits, naming the pair, but not signals on different multiplexer pages (as lintMap does)', () => {
		const model = buildBitGrid({
			length: 8,
			signals: [
				signal({ name: 'Page', startBit: 0, length: 8, multiplexer: true }),
				signal({ name: 'OilTemp', startBit: 8, length: 8, muxValue: 1 }),
				signal({ name: 'FuelTemp', startBit: 8, length: 8, muxValue: 2 }),
				signal({ name: 'Flags', startBit: 12, length: 8 })
			]
		});
		expect(model.overlaps).toEqual([
			{ a: 1, b: 3, bits: [12, 13, 14, 15] },
			{ a: 2, b: 3, bits: [12, 13, 14, 15] }
		]);
		expect(cellAt(model, 12).overlap).toBe(true);
		expect(cellAt(model, 8).overlap).toBe(false); // OilTemp and FuelTemp never share a payload
		expect(cellAt(model, 16).overlap).toBe(false);
	});

	it('adds flagged rows for bits beyond the payload and before byte 0', () => {
		const model = buildBitGrid({
			length: 2,
			signals: [
				signal({ name: 'Late', startBit: 12, length: 8 }),
				signal({ name: 'Early', startBit: 0, length: 10, byteOrder: 'big' })
			]
		});
		expect(model.rows.map((r) => [r.byte, r.inPayload])).toEqual([
			[-1, false],
			[0, true],
			[1, true],
			[2, false]
		]);
		expect(model.signals[0].outsideBits).toEqual([16, 17, 18, 19]);
		// Big-endian from byte 0 bit 0: 8 bits in byte 0, then bits 0–1 of the (missing) byte −1.
		expect(model.signals[1].outsideBits).toEqual([-8, -7]);
		expect(cellAt(model, 16).inPayload).toBe(false);
	});
});

describe('dragToField', () => {
	it('little-endian drag from bit 3 to bit 12 (either way round) is startBit 3, length 10 (value bit i = startBit + i)', () => {
		expect(dragToField(3, 12, 'little')).toEqual({ startBit: 3, length: 10 });
		expect(dragToField(12, 3, 'little')).toEqual({ startBit: 3, length: 10 });
	});

	it.each([
		// docs/bit-numbering.md: big-endian field filling bytes k … k+m−1 has startBit = 8·(k+m−1).
		{ k: 0, m: 2 },
		{ k: 2, m: 1 },
		{ k: 1, m: 4 },
		{ k: 0, m: 8 }
	])(
		'big-endian drag over whole bytes $k…(k+$m−1) gives startBit 8·(k+m−1) (docs/bit-numbering.md)',
		({ k, m }) => {
			const msb = 8 * k + 7; // top-left cell: bit 7 of byte k
			const lsb = 8 * (k + m - 1); // bottom-right cell: bit 0 of byte k+m−1
			expect(dragToField(msb, lsb, 'big')).toEqual({ startBit: 8 * (k + m - 1), length: 8 * m });
			expect(dragToField(lsb, msb, 'big')).toEqual({ startBit: 8 * (k + m - 1), length: 8 * m });
		}
	);

	it('the placed field covers exactly the dragged ends according to fieldBitPositions, for random drags', () => {
		const random = seededRandom(77).next;
		for (let n = 0; n < 300; n++) {
			const byteOrder: ByteOrder = random() < 0.5 ? 'little' : 'big';
			const a = Math.floor(random() * 64);
			const b = Math.floor(random() * 64);
			const field = dragToField(a, b, byteOrder);
			const bits = fieldBitPositions(field.startBit, field.length, byteOrder);
			expect([bits[0], bits.at(-1)].sort()).toEqual([a, b].sort());
		}
	});

	it('keeps at most 64 bits from the LSB', () => {
		expect(dragToField(0, 100, 'little')).toEqual({ startBit: 0, length: 64 });
	});
});

describe('nudgeField', () => {
	it('arrows move the start bit by a bit (←/→) or a byte (↑/↓) and stay inside the payload', () => {
		expect(nudgeField({ startBit: 8, length: 4 }, 'ArrowLeft', false, 8)).toEqual({
			startBit: 9,
			length: 4
		});
		expect(nudgeField({ startBit: 8, length: 4 }, 'ArrowRight', false, 8)).toEqual({
			startBit: 7,
			length: 4
		});
		expect(nudgeField({ startBit: 8, length: 4 }, 'ArrowDown', false, 8)).toEqual({
			startBit: 16,
			length: 4
		});
		expect(nudgeField({ startBit: 3, length: 4 }, 'ArrowUp', false, 8)).toEqual({
			startBit: 3,
			length: 4
		});
		expect(nudgeField({ startBit: 63, length: 1 }, 'ArrowLeft', false, 8)).toEqual({
			startBit: 63,
			length: 1
		});
	});

	it('Shift+arrows change the length within 1–64 bits', () => {
		expect(nudgeField({ startBit: 0, length: 4 }, 'ArrowLeft', true, 8)).toEqual({
			startBit: 0,
			length: 5
		});
		expect(nudgeField({ startBit: 0, length: 1 }, 'ArrowRight', true, 8)).toEqual({
			startBit: 0,
			length: 1
		});
		expect(nudgeField({ startBit: 0, length: 60 }, 'ArrowDown', true, 8)).toEqual({
			startBit: 0,
			length: 64
		});
		expect(nudgeField({ startBit: 0, length: 16 }, 'ArrowUp', true, 8)).toEqual({
			startBit: 0,
			length: 8
		});
	});
});

describe('labels and colours', () => {
	it('abbreviates names by initials or first letters and keeps them unique', () => {
		expect(abbreviate(['EngineSpeed', 'coolant_temp', 'Gear', 'Gearbox', 'Gear'])).toEqual([
			'ES',
			'CT',
			'Gea',
			'Gea2',
			'Gea3'
		]);
	});

	/** Shortest way round the hue circle between two hues, in degrees. */
	const hueDistance = (a: number, b: number) => {
		const d = Math.abs(a - b) % 360;
		return Math.min(d, 360 - d);
	};

	it.each([1, 2, 3, 4, 5, 6, 8, 12, 16, 24, 64])(
		'gives %i signals hues at least 360°/n apart, neighbours in the layout never closest',
		(n) => {
			const hues = signalHues(n);
			expect(new Set(hues).size).toBe(n);
			let closest = Infinity;
			for (let i = 0; i < n; i++)
				for (let j = i + 1; j < n; j++) closest = Math.min(closest, hueDistance(hues[i], hues[j]));
			if (n > 1) expect(closest).toBeGreaterThanOrEqual(360 / n - 1e-9);
			// Signals drawn one after the other are at least two slots apart once there are 5 or more.
			for (let k = 1; k < n; k++)
				expect(hueDistance(hues[k], hues[k - 1])).toBeGreaterThanOrEqual(
					(n >= 5 ? 2 : 1) * (360 / n) - 1e-9
				);
		}
	);

	it('orders hues by where signals sit in the payload', () => {
		const model = buildBitGrid({
			length: 2,
			signals: [
				signal({ name: 'High', startBit: 8, length: 8 }),
				signal({ name: 'Low', startBit: 0, length: 8 })
			]
		});
		// Low (bit 0) is drawn first: it gets the first hue, High the next slot, 180° away.
		expect(model.signals[1].hue).toBe(25);
		expect(model.signals[0].hue).toBe(205);
	});
});
