/** Literals and comments of generated C99 text. */

/** Exact C `double` literal: JavaScript prints the shortest text that reads back as the same double. */
export function doubleLiteral(value: number): string {
	if (!Number.isFinite(value)) throw new RangeError(`cannot write ${value} as a C literal`);
	if (Object.is(value, -0)) return '(-0.0)';
	const text = String(value);
	const literal = /[.e]/.test(text) ? text : `${text}.0`;
	return value < 0 ? `(${literal})` : literal;
}

/** C integer types of raw values, by signedness and width. */
export type IntType =
	'uint8_t' | 'uint16_t' | 'uint32_t' | 'uint64_t' | 'int8_t' | 'int16_t' | 'int32_t' | 'int64_t';

export function typeWidth(type: IntType): 8 | 16 | 32 | 64 {
	return Number(type.replace(/^u?int|_t$/g, '')) as 8 | 16 | 32 | 64;
}

/** Smallest exact-width type holding `bits` bits. */
export function intType(bits: number, signed: boolean): IntType {
	const width = bits <= 8 ? 8 : bits <= 16 ? 16 : bits <= 32 ? 32 : 64;
	return `${signed ? '' : 'u'}int${width}_t` as IntType;
}

/**
 * Integer constant of `type` (or one that converts to it without a warning). 64-bit values use the
 * <stdint.h> constant macros, so the literal has the right width even where `long` has 32 bits.
 * The most negative value is written as `(-MAX - 1)`, since C has no negative literals.
 */
export function intLiteral(value: bigint, type: IntType): string {
	const wide = typeWidth(type) === 64;
	if (type.startsWith('u')) {
		if (value < 0n) throw new RangeError(`${value} is not a ${type}`);
		if (wide) return `UINT64_C(${value})`;
		return value > 0x7fffn ? `${value}u` : String(value);
	}
	const macro = (v: bigint) => (wide ? `INT64_C(${v})` : String(v));
	if (value >= 0n) return macro(value);
	if (value === -(1n << 63n) || value === -(1n << 31n)) return `(-${macro(-value - 1n)} - 1)`;
	return `(-${macro(-value)})`;
}

/** Hexadecimal bit mask for operations in `type` (unsigned suffix where the value needs it). */
export function maskLiteral(mask: bigint, type: IntType): string {
	const hex = `0x${mask.toString(16).toUpperCase()}`;
	if (typeWidth(type) === 64) return `UINT64_C(${hex})`;
	// Promoted 8/16-bit operands are int: an int mask keeps the expression signed-free of conversions.
	return mask > 0x7fffn ? `${hex}u` : hex;
}

/**
 * Text safe inside a block comment: one line, no comment delimiters, no trigraphs (C99 5.2.1.1 turns
 * `??/` into a backslash), no control characters.
 */
export function commentText(text: string): string {
	return text
		.replace(/\p{Cc}+/gu, ' ')
		.replace(/\*\//g, '* /')
		.replace(/\/\*/g, '/ *')
		.replace(/\?\?/g, '? ?')
		.trim();
}
