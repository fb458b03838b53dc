/**
 * What the bit layout grid shows, as plain data: which signal owns each payload bit, where each
 * signal's least significant bit sits, which way it continues into the next byte, and which bits
 * clash or lie beyond the payload. Also turns a pointer drag or an arrow key into a new
 * startBit/length. All bit positions come from the core library's `fieldBitPositions`
 * (the one bit numbering, docs/bit-numbering.md), so the grid can never disagree with the decoder.
 */
import { fieldBitPositions } from '$lib/can/bits';
import { presentTogether } from '$lib/can/lint';
import type { ByteOrder, Frame, Signal } from '$lib/can/map';

/** Highest start bit the map schema accepts (a 64-byte CAN FD payload has 512 bits). */
const MAX_START_BIT = 511;
const MAX_LENGTH = 64;

export interface CellOwner {
	/** Index of the signal in the frame. */
	signal: number;
	/** Which value bit of the signal this payload bit carries (0 = least significant). */
	valueBit: number;
	lsb: boolean;
	msb: boolean;
	/** The next more significant bit lies in another byte: the following one (little) or the one before (big). */
	continues: 'next-byte' | 'previous-byte' | null;
}

export interface GridCell {
	/** Payload bit number (negative when a big-endian field runs before byte 0). */
	bit: number;
	byte: number;
	bitInByte: number;
	inPayload: boolean;
	owners: CellOwner[];
	/** Two signals that can be present in the same payload both claim this bit. */
	overlap: boolean;
}

export interface GridRow {
	byte: number;
	inPayload: boolean;
	/** Bits 7 … 0, left to right. */
	cells: GridCell[];
}

export interface GridSignal {
	index: number;
	name: string;
	abbreviation: string;
	hue: number;
	byteOrder: ByteOrder;
	/** Payload bits beyond the frame's length (or before byte 0). */
	outsideBits: number[];
}

export interface GridOverlap {
	a: number;
	b: number;
	bits: number[];
}

export interface BitGridModel {
	rows: GridRow[];
	signals: GridSignal[];
	overlaps: GridOverlap[];
}

type GridFrame = Pick<Frame, 'length'> & { signals: Signal[] };

const byteOf = (bit: number) => Math.floor(bit / 8);

/** Greatest common divisor, for choosing a stride that visits every hue slot once. */
const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));

/**
 * Hues for `count` signals: evenly spaced around the circle (so any two differ by at least
 * 360°/count), visited with a stride near count × 0.382 (the golden section) so signals next to
 * each other in the layout land far apart on the circle. `order[k]` is the signal drawn k-th from bit 0 upwards.
 */
export function signalHues(
	count: number,
	order: readonly number[] = [...Array(count).keys()]
): number[] {
	const hues = new Array<number>(count).fill(0);
	if (count === 0) return hues;
	const stride = Math.max(1, Math.round(count * 0.382));
	// When the stride shares a factor with count it comes back to slot 0 early: step one slot on.
	const cycle = count / gcd(stride, count);
	// Start at 25° so a lone signal is an orange-ish tone rather than pure red.
	order.forEach((signal, k) => {
		const slot = (k * stride + Math.floor(k / cycle)) % count;
		hues[signal] = 25 + slot * (360 / count);
	});
	return hues;
}

function words(name: string): string[] {
	return name
		.replace(/([a-z0-9])([A-Z])/g, '$1 $2')
		.split(/[^A-Za-z0-9]+/)
		.filter(Boolean);
}

/** Short cell labels (initials, or the first letters of a one-word name), unique within the frame. */
export function abbreviate(names: readonly string[]): string[] {
	const base = names.map((name) => {
		const parts = words(name);
		if (parts.length === 0) return '?';
		if (parts.length === 1) return parts[0].slice(0, 3);
		return parts
			.slice(0, 3)
			.map((w) => (/^\d/.test(w) ? w : w[0].toUpperCase()))
			.join('');
	});
	const seen = new Map<string, number>();
	return base.map((abbr) => {
		const count = (seen.get(abbr) ?? 0) + 1;
		seen.set(abbr, count);
		return count === 1 ? abbr : `${abbr}${count}`;
	});
}

export function buildBitGrid(frame: GridFrame): BitGridModel {
	const positions = frame.signals.map((s) => fieldBitPositions(s.startBit, s.length, s.byteOrder));
	const payloadBits = frame.length * 8;
	const inPayload = (bit: number) => bit >= 0 && bit < payloadBits;

	// Rows for the payload, plus any bytes signals reach beyond it so those bits can be shown and flagged.
	let firstByte = 0;
	let lastByte = frame.length - 1;
	for (const list of positions) {
		for (const bit of list) {
			firstByte = Math.min(firstByte, byteOf(bit));
			lastByte = Math.max(lastByte, byteOf(bit));
		}
	}

	const cells = new Map<number, GridCell>();
	const rows: GridRow[] = [];
	for (let byte = firstByte; byte <= lastByte; byte++) {
		const row: GridRow = { byte, inPayload: byte >= 0 && byte < frame.length, cells: [] };
		for (let bitInByte = 7; bitInByte >= 0; bitInByte--) {
			const bit = byte * 8 + bitInByte;
			const cell: GridCell = {
				bit,
				byte,
				bitInByte,
				inPayload: inPayload(bit),
				owners: [],
				overlap: false
			};
			row.cells.push(cell);
			cells.set(bit, cell);
		}
		rows.push(row);
	}

	positions.forEach((list, signal) => {
		list.forEach((bit, valueBit) => {
			const next = list[valueBit + 1];
			const continues =
				next === undefined || byteOf(next) === byteOf(bit)
					? null
					: byteOf(next) > byteOf(bit)
						? 'next-byte'
						: 'previous-byte';
			cells.get(bit)!.owners.push({
				signal,
				valueBit,
				lsb: valueBit === 0,
				msb: valueBit === list.length - 1,
				continues
			});
		});
	});

	const overlapBits = new Map<string, GridOverlap>();
	for (const cell of cells.values()) {
		const { owners } = cell;
		for (let i = 0; i < owners.length; i++) {
			for (let j = i + 1; j < owners.length; j++) {
				const [a, b] = [owners[i].signal, owners[j].signal].sort((x, y) => x - y);
				if (!presentTogether(frame.signals[a], frame.signals[b])) continue;
				cell.overlap = true;
				const key = `${a}:${b}`;
				const entry = overlapBits.get(key) ?? { a, b, bits: [] };
				entry.bits.push(cell.bit);
				overlapBits.set(key, entry);
			}
		}
	}
	const overlaps = [...overlapBits.values()]
		.map((o) => ({ ...o, bits: o.bits.sort((x, y) => x - y) }))
		.sort((x, y) => x.a - y.a || x.b - y.b);

	const abbreviations = abbreviate(frame.signals.map((s) => s.name));
	// Neighbours in the grid are signals next to each other by their lowest bit.
	const lowest = positions.map((list) => (list.length ? Math.min(...list) : Infinity));
	const hues = signalHues(
		frame.signals.length,
		frame.signals.map((_, i) => i).sort((a, b) => lowest[a] - lowest[b] || a - b)
	);
	const signals = frame.signals.map((s, index) => ({
		index,
		name: s.name,
		abbreviation: abbreviations[index],
		hue: hues[index],
		byteOrder: s.byteOrder,
		outsideBits: positions[index].filter((bit) => !inPayload(bit))
	}));

	return { rows, signals, overlaps };
}

export interface BitField {
	startBit: number;
	length: number;
}

/**
 * The field covering every bit from one dragged-over bit to the other in the given byte order.
 * Whichever end the other end can be reached from, walking towards more significant bits, is the LSB;
 * a drag longer than 64 bits keeps the first 64 from the LSB.
 */
export function dragToField(fromBit: number, toBit: number, byteOrder: ByteOrder): BitField {
	const reach = MAX_START_BIT + 1 + 8; // far enough to reach any bit of the largest payload
	for (const [lsb, other] of [
		[fromBit, toBit],
		[toBit, fromBit]
	]) {
		const index = fieldBitPositions(lsb, reach, byteOrder).indexOf(other);
		if (index >= 0) return { startBit: lsb, length: Math.min(index + 1, MAX_LENGTH) };
	}
	throw new RangeError(
		`bits ${fromBit} and ${toBit} are not connected in ${byteOrder}-endian order`
	);
}

export type ArrowKey = 'ArrowLeft' | 'ArrowRight' | 'ArrowUp' | 'ArrowDown';

export function isArrowKey(key: string): key is ArrowKey {
	return key === 'ArrowLeft' || key === 'ArrowRight' || key === 'ArrowUp' || key === 'ArrowDown';
}

const clamp = (value: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, value));

/**
 * Keyboard alternative to dragging. Columns run bit 7 … 0 left to right and bytes top to bottom, so
 * ← / → move the start bit one bit up / down and ↑ / ↓ one byte; with Shift, ← / ↓ lengthen and
 * → / ↑ shorten (by one bit, or by one byte vertically). The start bit stays inside the payload.
 */
export function nudgeField(
	field: BitField,
	key: ArrowKey,
	resize: boolean,
	payloadLength: number
): BitField {
	const delta = { ArrowLeft: 1, ArrowRight: -1, ArrowDown: 8, ArrowUp: -8 }[key];
	if (resize)
		return { startBit: field.startBit, length: clamp(field.length + delta, 1, MAX_LENGTH) };
	const lastBit = Math.min(MAX_START_BIT, Math.max(0, payloadLength * 8 - 1));
	const moved = field.startBit + delta;
	return { startBit: moved < 0 || moved > lastBit ? field.startBit : moved, length: field.length };
}
