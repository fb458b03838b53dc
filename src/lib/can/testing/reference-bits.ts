import type { ByteOrder } from '../map';

/**
 * Independent slow reference, written straight from the bit numbering of docs/bit-numbering.md and nothing else:
 * walk the value bits one by one (little: startBit + i; big: up to bit 7, then bit 0 of the previous byte).
 */
export function referencePositions(startBit: number, length: number, order: ByteOrder): number[] {
	const out: number[] = [];
	let byte = Math.floor(startBit / 8);
	let bitInByte = startBit % 8;
	for (let i = 0; i < length; i++) {
		out.push(byte * 8 + bitInByte);
		bitInByte++;
		if (bitInByte === 8) {
			bitInByte = 0;
			byte += order === 'little' ? 1 : -1;
		}
	}
	return out;
}

export function referenceExtract(
	data: Uint8Array,
	startBit: number,
	length: number,
	order: ByteOrder
): bigint {
	let value = '';
	for (const p of referencePositions(startBit, length, order)) {
		value = String((data[Math.floor(p / 8)] >> (p % 8)) & 1) + value; // build MSB-first bit string
	}
	return BigInt('0b' + value);
}
