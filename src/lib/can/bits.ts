/**
 * Raw bit-field access in a CAN payload, following the one bit numbering of docs/bit-numbering.md:
 * payload bit b is bit (b % 8) of byte floor(b / 8); `startBit` is the field's least significant bit;
 * `little` climbs through the payload bit numbers, `big` climbs to bit 7 of a byte and continues at
 * bit 0 of the previous byte.
 *
 * Both orders therefore look the same byte by byte: the field starts `startBit % 8` bits into the
 * byte holding its LSB and takes further bytes in steps of +1 (little) or −1 (big). Every helper
 * here works from that "layout", so the two orders share one code path.
 */
import type { ByteOrder } from './map';

export interface FieldLayout {
	/** Byte holding the field's least significant bit. */
	lsbByte: number;
	/** Bit position of the LSB inside `lsbByte`. */
	shift: number;
	length: number;
	/** +1 when more significant bits sit in later bytes (little), −1 when in earlier bytes (big). */
	step: 1 | -1;
	/** Bytes the field touches. */
	byteCount: number;
	/** Lowest and highest byte index touched; lowByte < 0 means a big-endian field runs off byte 0. */
	lowByte: number;
	highByte: number;
}

export function fieldLayout(startBit: number, length: number, byteOrder: ByteOrder): FieldLayout {
	if (!Number.isInteger(startBit) || startBit < 0) {
		throw new RangeError(`start bit must be a whole number ≥ 0, got ${startBit}`);
	}
	if (!Number.isInteger(length) || length < 1 || length > 64) {
		throw new RangeError(`field length must be 1–64 bits, got ${length}`);
	}
	const lsbByte = startBit >> 3;
	const shift = startBit & 7;
	const byteCount = (shift + length + 7) >> 3;
	const step = byteOrder === 'little' ? 1 : -1;
	const farByte = lsbByte + step * (byteCount - 1);
	return {
		lsbByte,
		shift,
		length,
		step,
		byteCount,
		lowByte: Math.min(lsbByte, farByte),
		highByte: Math.max(lsbByte, farByte)
	};
}

/** True when every bit of the field lies inside a payload of `payloadLength` bytes. */
export function fieldFits(layout: FieldLayout, payloadLength: number): boolean {
	return layout.lowByte >= 0 && layout.highByte < payloadLength;
}

/** Payload bit numbers of value bits 0…length−1 (LSB first) — for overlap checks and bit grids. */
export function fieldBitPositions(
	startBit: number,
	length: number,
	byteOrder: ByteOrder
): number[] {
	const positions: number[] = [];
	let bit = startBit;
	for (let i = 0; i < length; i++) {
		positions.push(bit);
		if (byteOrder === 'little' || (bit & 7) !== 7) bit += 1;
		else bit -= 15; // big: after bit 7 of byte n comes bit 0 of byte n − 1
	}
	return positions;
}

/** Throws a RangeError naming the bytes needed when the field does not fit the payload. */
export function assertFits(layout: FieldLayout, payloadLength: number): void {
	if (!fieldFits(layout, payloadLength)) {
		throw new RangeError(
			`bit field needs bytes ${layout.lowByte}…${layout.highByte} but the payload has ${payloadLength} byte(s)`
		);
	}
}

/**
 * Unsigned value of up to 32 bits as a number, reading from `data[base + …]`.
 * Exact: at most 5 bytes (shift ≤ 7 plus 32 bits) are summed, far below 2^53.
 */
export function readUnsigned32(
	data: Uint8Array,
	base: number,
	lsbByte: number,
	shift: number,
	length: number,
	step: number
): number {
	const byteCount = (shift + length + 7) >> 3;
	let acc = 0;
	let weight = 1;
	let index = base + lsbByte;
	for (let j = 0; j < byteCount; j++) {
		acc += data[index] * weight;
		weight *= 256;
		index += step;
	}
	// Division and modulo instead of >>/& because JavaScript bit operators are 32-bit signed.
	return Math.floor(acc / 2 ** shift) % 2 ** length;
}

/**
 * Raw integer of any length 1–64 as a number (exact up to 53 bits, correctly rounded above):
 * the low 32 bits and the rest are read separately and joined with one rounding step.
 * Moving 32 value bits up is exactly 4 bytes further in the layout's step direction.
 */
export function readIntegerNumber(
	data: Uint8Array,
	base: number,
	layout: FieldLayout,
	signed: boolean
): number {
	const { lsbByte, shift, length, step } = layout;
	if (length <= 32) {
		const u = readUnsigned32(data, base, lsbByte, shift, length, step);
		return signed && u >= 2 ** (length - 1) ? u - 2 ** length : u;
	}
	const low = readUnsigned32(data, base, lsbByte, shift, 32, step);
	const highLength = length - 32;
	let high = readUnsigned32(data, base, lsbByte + 4 * step, shift, highLength, step);
	if (signed && high >= 2 ** (highLength - 1)) high -= 2 ** highLength;
	return high * 4294967296 + low;
}

/** Scratch space for turning raw bit patterns into IEEE 754 values. */
const scratch = new DataView(new ArrayBuffer(8));

/** IEEE 754 binary32/binary64 value stored in the field (length must be 32 or 64). */
export function readFloatNumber(data: Uint8Array, base: number, layout: FieldLayout): number {
	const { lsbByte, shift, length, step } = layout;
	if (length === 32) {
		scratch.setUint32(0, readUnsigned32(data, base, lsbByte, shift, 32, step));
		return scratch.getFloat32(0);
	}
	if (length === 64) {
		scratch.setUint32(0, readUnsigned32(data, base, lsbByte + 4 * step, shift, 32, step));
		scratch.setUint32(4, readUnsigned32(data, base, lsbByte, shift, 32, step));
		return scratch.getFloat64(0);
	}
	throw new RangeError(`a float field must be 32 or 64 bits long, got ${length}`);
}

/** Unsigned raw bits of a field as a BigInt (exact for every length). */
export function extractRaw(
	data: Uint8Array,
	startBit: number,
	length: number,
	byteOrder: ByteOrder
): bigint {
	const layout = fieldLayout(startBit, length, byteOrder);
	assertFits(layout, data.length);
	if (length <= 32) {
		return BigInt(readUnsigned32(data, 0, layout.lsbByte, layout.shift, length, layout.step));
	}
	let acc = 0n;
	let index = layout.lsbByte + layout.step * (layout.byteCount - 1);
	for (let j = 0; j < layout.byteCount; j++) {
		acc = (acc << 8n) | BigInt(data[index]);
		index -= layout.step;
	}
	return BigInt.asUintN(length, acc >> BigInt(layout.shift));
}

/**
 * Write `raw` into the field, leaving every other payload bit untouched. Accepts the unsigned
 * (0 … 2^n − 1) or two's complement (−2^(n−1) … −1) reading; anything else would be truncated, so it throws.
 */
export function insertRaw(
	data: Uint8Array,
	startBit: number,
	length: number,
	byteOrder: ByteOrder,
	raw: bigint
): void {
	const layout = fieldLayout(startBit, length, byteOrder);
	assertFits(layout, data.length);
	const span = 1n << BigInt(length);
	if (raw >= span || raw < -(span >> 1n)) {
		throw new RangeError(`raw value ${raw} does not fit in ${length} bits`);
	}
	const shift = BigInt(layout.shift);
	const value = BigInt.asUintN(length, raw) << shift;
	const mask = (span - 1n) << shift;
	let index = layout.lsbByte;
	for (let j = 0; j < layout.byteCount; j++) {
		const at = BigInt(8 * j);
		const byteMask = Number((mask >> at) & 0xffn);
		const byteValue = Number((value >> at) & 0xffn);
		data[index] = (data[index] & ~byteMask) | byteValue;
		index += layout.step;
	}
}
