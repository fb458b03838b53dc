/**
 * C statements that move a raw bit field between a payload and an integer, in the bit numbering of
 * docs/bit-numbering.md (via `fieldLayout`: the byte holding the least significant bit, the shift inside
 * it, and the step to the next more significant byte: +1 little-endian, −1 big-endian).
 * Integer operations only, one statement per byte, no loops: what a firmware engineer would write by hand.
 */
import type { FieldLayout } from '../bits';
import { maskLiteral, typeWidth, type IntType } from './c-text';

/** Payload byte index and the field bits it carries. */
interface ByteSlice {
	index: number;
	/** Value bit that sits at `low` of this byte. */
	valueBit: number;
	/** Lowest payload bit of the byte used by the field. */
	low: number;
	/** Number of field bits in this byte. */
	count: number;
}

function slices(layout: FieldLayout): ByteSlice[] {
	const result: ByteSlice[] = [];
	let valueBit = 0;
	for (let j = 0; j < layout.byteCount; j++) {
		const low = j === 0 ? layout.shift : 0;
		const count = Math.min(8 - low, layout.length - valueBit);
		result.push({ index: layout.lsbByte + layout.step * j, valueBit, low, count });
		valueBit += count;
	}
	return result;
}

const bitMask = (bits: number) => (1n << BigInt(bits)) - 1n;

/**
 * Expression of unsigned type `type` holding the field's raw bits, read from `data`.
 * Each byte is widened to `type` before it is shifted, so no shift exceeds its operand's width.
 */
export function unpackExpression(layout: FieldLayout, type: IntType): string {
	const parts = slices(layout).map(({ index, valueBit, low }) => {
		const byte = `(${type})data[${index}]`;
		if (valueBit === 0) return low ? `(${byte} >> ${low})` : byte;
		return `(${byte} << ${valueBit - low})`;
	});
	const coveredBits = 8 * layout.byteCount - layout.shift;
	// Long fields put one byte per line, continuing the statement the caller writes at depth 1.
	const joined = parts.length > 3 ? parts.join('\n\t\t| ') : parts.join(' | ');
	const masked = coveredBits > layout.length && layout.length < typeWidth(type);
	const inner = parts.length === 1 ? joined : `(${joined})`;
	if (masked) return `(${type})(${inner} & ${maskLiteral(bitMask(layout.length), type)})`;
	return parts.length === 1 && layout.shift === 0 ? joined : `(${type})${inner}`;
}

/**
 * Statements writing the low `layout.length` bits of `value` (an unsigned `type` variable) into the
 * field; every other payload bit keeps its value.
 */
export function packStatements(layout: FieldLayout, value: string, type: IntType): string[] {
	return slices(layout).map(({ index, valueBit, low, count }) => {
		const shifted =
			valueBit === 0 ? (low ? `(${value} << ${low})` : value) : `(${value} >> ${valueBit - low})`;
		const fieldMask = bitMask(count) << BigInt(low);
		if (fieldMask === 0xffn) return `data[${index}] = (uint8_t)${shifted};`;
		const keep = maskLiteral(0xffn ^ fieldMask, 'uint8_t');
		// The field mask is applied in `type`, then narrowed, so no 64-bit constant meets a byte.
		return `data[${index}] = (uint8_t)((data[${index}] & ${keep}) | (uint8_t)(${shifted} & ${maskLiteral(fieldMask, type)}));`;
	});
}

/** Two's complement value of an `length`-bit unsigned `u` as `signedType`, without implementation-defined conversions. */
export function signExtendExpression(
	u: string,
	length: number,
	unsignedType: IntType,
	signedType: IntType
): string {
	const sign = maskLiteral(1n << BigInt(length - 1), unsignedType);
	const all = maskLiteral(bitMask(length), unsignedType);
	// u ≥ 2^(n−1) stands for u − 2^n = −((2^n − 1 − u) + 1); 2^n − 1 − u < 2^(n−1) always fits.
	return `(${u} & ${sign}) ? (${signedType})(-(${signedType})(${all} - ${u}) - 1) : (${signedType})${u}`;
}
