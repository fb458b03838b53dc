/**
 * One signal ↔ physical value: physical = raw × scale + offset (docs/bit-numbering.md), with value labels,
 * min/max checks and multiplexing. Encoding is the exact inverse: round to the nearest raw value
 * and clamp to what the field can hold.
 */
import { assertFits, extractRaw, fieldFits, fieldLayout, insertRaw, readFloatNumber } from './bits';
import type { Frame, Signal } from './map';

export interface DecodedSignal {
	/** Integer raw value (a bigint above 53 bits), or the IEEE 754 value of a float field. */
	raw: number | bigint;
	value: number;
	label: string | null;
	/** Inside [min, max] (a null bound is open). */
	inRange: boolean;
}

export interface EncodedSignal {
	/** Integer written (two's complement value for signed fields, the IEEE 754 bit pattern for floats). */
	raw: bigint;
	/** The physical value asked for did not fit the field and was clamped to its nearest end. */
	clamped: boolean;
	/** The physical value asked for lies outside the signal's min/max. */
	outOfRange: boolean;
}

/** Integers up to this length are returned as plain numbers (always exact, |raw| ≤ 2^53). */
const NUMBER_RAW_BITS = 53;

function isFloat(signal: Signal): boolean {
	return signal.valueType === 'float32' || signal.valueType === 'float64';
}

function assertFloatLength(signal: Signal): void {
	const expected = signal.valueType === 'float32' ? 32 : 64;
	if (signal.length !== expected) {
		throw new RangeError(
			`signal "${signal.name}" is ${signal.valueType} but ${signal.length} bits long`
		);
	}
}

export function inRange(signal: Pick<Signal, 'min' | 'max'>, value: number): boolean {
	if (Number.isNaN(value)) return false;
	return (
		(signal.min === null || value >= signal.min) && (signal.max === null || value <= signal.max)
	);
}

export function labelFor(signal: Signal, raw: number | bigint): string | null {
	return signal.labels[String(raw)] ?? null;
}

export function decodeSignal(signal: Signal, data: Uint8Array): DecodedSignal {
	let raw: number | bigint;
	if (isFloat(signal)) {
		assertFloatLength(signal);
		raw = readFloatNumber(data, 0, checkedLayout(signal, data));
	} else {
		const bits = extractRaw(data, signal.startBit, signal.length, signal.byteOrder);
		const integer = signal.valueType === 'signed' ? BigInt.asIntN(signal.length, bits) : bits;
		raw = signal.length <= NUMBER_RAW_BITS ? Number(integer) : integer;
	}
	const value = Number(raw) * signal.scale + signal.offset;
	return {
		raw,
		value,
		label: isFloat(signal) ? null : labelFor(signal, raw),
		inRange: inRange(signal, value)
	};
}

function checkedLayout(signal: Signal, data: Uint8Array) {
	const layout = fieldLayout(signal.startBit, signal.length, signal.byteOrder);
	assertFits(layout, data.length);
	return layout;
}

/** Smallest and largest integer the field can hold. */
export function rawBounds(signal: Pick<Signal, 'length' | 'valueType'>): {
	lo: bigint;
	hi: bigint;
} {
	const span = 1n << BigInt(signal.length);
	return signal.valueType === 'signed'
		? { lo: -(span >> 1n), hi: (span >> 1n) - 1n }
		: { lo: 0n, hi: span - 1n };
}

const FLOAT32_MAX = 3.4028234663852886e38; // largest finite binary32 (IEEE 754)
const scratch = new DataView(new ArrayBuffer(8));

export function encodeSignal(signal: Signal, physical: number, data: Uint8Array): EncodedSignal {
	if (!Number.isFinite(physical))
		throw new RangeError(`cannot encode ${physical} into "${signal.name}"`);
	if (signal.scale === 0)
		throw new RangeError(
			`signal "${signal.name}" has scale 0, so no raw value maps to ${physical}`
		);
	const outOfRange = !inRange(signal, physical);
	const exact = (physical - signal.offset) / signal.scale;
	let raw: bigint;
	let clamped = false;
	if (isFloat(signal)) {
		assertFloatLength(signal);
		let stored = exact;
		if (signal.valueType === 'float32' && Math.abs(exact) > FLOAT32_MAX) {
			stored = Math.sign(exact) * FLOAT32_MAX;
			clamped = true;
		} else if (!Number.isFinite(exact)) {
			stored = Math.sign(exact) * Number.MAX_VALUE;
			clamped = true;
		}
		if (signal.valueType === 'float32') {
			scratch.setFloat32(0, stored);
			raw = BigInt(scratch.getUint32(0));
		} else {
			scratch.setFloat64(0, stored);
			raw = scratch.getBigUint64(0);
		}
	} else {
		const { lo, hi } = rawBounds(signal);
		// Math.round: nearest raw, halves towards +∞. Beyond ±2^53 the quotient is already integral.
		const rounded = Number.isFinite(exact) ? BigInt(Math.round(exact)) : exact > 0 ? hi : lo;
		raw = rounded < lo ? lo : rounded > hi ? hi : rounded;
		// An infinite quotient (a huge value over a tiny scale) lands on an end of the field: clamped too.
		clamped = raw !== rounded || !Number.isFinite(exact);
	}
	insertRaw(data, signal.startBit, signal.length, signal.byteOrder, raw);
	return { raw, clamped, outOfRange };
}

/** Index of the frame's multiplexer signal (the first, if a faulty map has several), or −1. */
export function multiplexerIndex(frame: Pick<Frame, 'signals'>): number {
	return frame.signals.findIndex((s) => s.multiplexer);
}

export type FrameSignalResult = ({ present: true } & DecodedSignal) | { present: false };

/**
 * Decode every signal of a frame, honouring multiplexing: a signal with a muxValue is present only
 * when the multiplexer carries that value; a muxValue in a frame without multiplexer is never present.
 * Signals whose bits lie beyond the received payload are absent too.
 */
export function decodeFrame(frame: Pick<Frame, 'signals'>, data: Uint8Array): FrameSignalResult[] {
	const fits = (s: Signal) =>
		fieldFits(fieldLayout(s.startBit, s.length, s.byteOrder), data.length);
	const muxAt = multiplexerIndex(frame);
	const muxSignal = muxAt >= 0 ? frame.signals[muxAt] : null;
	const selected = muxSignal && fits(muxSignal) ? Number(decodeSignal(muxSignal, data).raw) : null;
	return frame.signals.map((s) => {
		const present = (s.muxValue === null || s.muxValue === selected) && fits(s);
		return present
			? { present: true as const, ...decodeSignal(s, data) }
			: { present: false as const };
	});
}
