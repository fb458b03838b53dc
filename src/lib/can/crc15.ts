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

/** CRC-15 over whole bytes, most significant bit of each byte first. */
export function crc15Bytes(bytes: ArrayLike<number>): number {
	let crc = 0;
	for (let i = 0; i < bytes.length; i++) {
		for (let b = 7; b >= 0; b--) crc = crc15Step(crc, (bytes[i] >> b) & 1);
	}
	return crc;
}
