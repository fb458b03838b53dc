/**
 * Slow bit-by-bit reference for frameBits, kept to check the byte-wise fast path: the frame is
 * spelled out as a string of '0'/'1' field by field straight from ISO 11898-1, the CRC is a plain
 * polynomial long division over GF(2) with BigInt (referenceCrc15), and stuff bits are counted one
 * bit at a time. It uses nothing from the library, so it can check the library's CRC as well.
 */

/**
 * CRC-15 by polynomial long division: the remainder of M(x)·x^15 divided by x^15 + 0x4599, the
 * ISO 11898-1 generator (init 0, no final XOR). Independent of crc15's shift register and table.
 */
export function referenceCrc15(bits: ArrayLike<number>): number {
	let m = 0n;
	for (let i = 0; i < bits.length; i++) m = (m << 1n) | BigInt(bits[i]);
	m <<= 15n;
	const gen = (1n << 15n) | 0x4599n;
	for (let shift = BigInt(bits.length); shift >= 0n; shift--) {
		if ((m >> (shift + 15n)) & 1n) m ^= gen << shift;
	}
	return Number(m);
}

export function referenceFrameBits(
	id: number,
	extended: boolean,
	data: Uint8Array
): { bits: number; stuffBits: number; crc: number } {
	const field = (value: number, width: number) => value.toString(2).padStart(width, '0');
	const header = extended
		? // SOF, base ID (top 11 bits), SRR=1, IDE=1, 18-bit extension, RTR=0, r1=0, r0=0, DLC
			'0' +
			field(Math.floor(id / 2 ** 18), 11) +
			'11' +
			field(id % 2 ** 18, 18) +
			'000' +
			field(data.length, 4)
		: // SOF, 11-bit ID, RTR=0, IDE=0, r0=0, DLC
			'0' + field(id, 11) + '000' + field(data.length, 4);
	const body = header + Array.from(data, (b) => field(b, 8)).join('');
	const crc = referenceCrc15(Array.from(body, Number));
	const stuffed = body + field(crc, 15); // SOF … CRC sequence is stuffed
	let stuffBits = 0;
	let run = 0;
	let last = '';
	for (const bit of stuffed) {
		run = bit === last ? run + 1 : 1;
		last = bit;
		if (run === 5) {
			stuffBits++;
			// The inserted complement starts the next run (ISO 11898-1).
			last = bit === '0' ? '1' : '0';
			run = 1;
		}
	}
	// CRC delimiter, ACK slot, ACK delimiter and 7 EOF bits follow unstuffed.
	return { bits: stuffed.length + 10, stuffBits, crc };
}
