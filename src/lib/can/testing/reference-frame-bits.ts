import { crc15 } from '../crc15';

/**
 * Slow bit-by-bit reference for frameBits, kept to check the byte-wise fast path: the frame is
 * spelled out as a string of '0'/'1' field by field straight from ISO 11898-1, the CRC is the
 * shift register fed one bit at a time (crc15), and stuff bits are counted one bit at a time.
 */
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
	const crc = crc15(Array.from(body, Number));
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
