/**
 * Walking a payload's bits in value order. A field is a run of consecutive bits along a "chain":
 * little-endian climbs through the payload bit numbers; big-endian climbs to bit 7 of a byte and
 * continues at bit 0 of the previous byte (docs/bit-numbering.md). Inside one byte both chains agree.
 */
import type { ByteOrder } from '../map';

/** The next more significant bit after `bit` in that order, or −1 past the payload's end. */
export function bitAbove(bit: number, order: ByteOrder, payloadLength: number): number {
	if (order === 'little') return bit + 1 < payloadLength * 8 ? bit + 1 : -1;
	if ((bit & 7) !== 7) return bit + 1;
	return bit >= 8 ? bit - 15 : -1;
}

/** The next less significant bit before `bit` in that order, or −1. */
export function bitBelow(bit: number, order: ByteOrder, payloadLength: number): number {
	if (order === 'little') return bit - 1;
	if ((bit & 7) !== 0) return bit - 1;
	return (bit >> 3) + 1 < payloadLength ? bit + 15 : -1;
}

/** Every payload bit, least significant first along the chain of that order. */
export function chainOrder(order: ByteOrder, payloadLength: number): number[] {
	const bits: number[] = [];
	for (let k = 0; k < payloadLength; k++) {
		const byte = order === 'little' ? k : payloadLength - 1 - k;
		for (let j = 0; j < 8; j++) bits.push(byte * 8 + j);
	}
	return bits;
}

/** Payload bits of a field, least significant first. */
export function fieldBits(
	startBit: number,
	length: number,
	order: ByteOrder,
	payloadLength: number
): number[] {
	const bits = [startBit];
	while (bits.length < length) bits.push(bitAbove(bits[bits.length - 1], order, payloadLength));
	return bits;
}
