/**
 * Slow bit-by-bit CRC-8, written from the definition of a CRC as polynomial division over GF(2)
 * (message bits MSB first, no reflection): shift each message bit into the register and subtract
 * (XOR) the generator whenever the bit leaving the register differs from the incoming bit.
 * Independent of the table-driven library code it checks.
 */
export function referenceCrc8(
	bytes: ArrayLike<number>,
	poly: number,
	init: number,
	xorout: number
) {
	let register = init;
	for (let i = 0; i < bytes.length; i++) {
		for (let bit = 7; bit >= 0; bit--) {
			const incoming = (bytes[i] >> bit) & 1;
			const leaving = (register >> 7) & 1;
			register = (register << 1) & 0xff;
			if (leaving !== incoming) register ^= poly;
		}
	}
	return register ^ xorout;
}
