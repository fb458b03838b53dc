/**
 * CRC-15 of classical CAN frames (ISO 11898-1): generator polynomial
 * x^15 + x^14 + x^10 + x^8 + x^7 + x^4 + x^3 + 1 = 0x4599, register initialised to 0,
 * no reflection, no final XOR (the catalogue's "CRC-15/CAN").
 */

/** Generator polynomial without the x^15 term. ISO 11898-1. */
export const CRC15_POLY = 0x4599;

/** Shifts one bit into the 15-bit CRC register, as ISO 11898-1 describes the CRC calculation. */
export function crc15Step(crc: number, bit: number): number {
	const feedback = (bit & 1) ^ ((crc >> 14) & 1);
	crc = (crc << 1) & 0x7fff;
	return feedback ? crc ^ CRC15_POLY : crc;
}

/** CRC-15 over a sequence of bits (each 0 or 1), first bit first — e.g. SOF through the data field. */
export function crc15(bits: ArrayLike<number>): number {
	let crc = 0;
	for (let i = 0; i < bits.length; i++) crc = crc15Step(crc, bits[i]);
	return crc;
}

/**
 * The register after shifting in the 8 bits of `b` (MSB first) starting from `b << 7`, i.e. the
 * usual byte-wise table of an unreflected CRC, built from crc15Step itself so both paths agree.
 */
const CRC15_TABLE = Uint16Array.from({ length: 256 }, (_, b) => {
	let crc = b << 7;
	for (let k = 0; k < 8; k++) crc = crc15Step(crc, 0);
	return crc;
});

/** Eight crc15Step calls in one: shifts `byte` into the register, most significant bit first. */
export function crc15UpdateByte(crc: number, byte: number): number {
	return ((crc << 8) & 0x7fff) ^ CRC15_TABLE[((crc >> 7) ^ byte) & 0xff];
}

/** CRC-15 over whole bytes, most significant bit of each byte first. */
export function crc15Bytes(bytes: ArrayLike<number>): number {
	let crc = 0;
	for (let i = 0; i < bytes.length; i++) crc = crc15UpdateByte(crc, bytes[i]);
	return crc;
}
