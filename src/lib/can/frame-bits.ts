/**
 * Bit-level layout of classical CAN data frames (ISO 11898-1): the exact bit sequence, its CRC,
 * the stuff bits it needs, and the worst-case stuffed length for bus load and timing analysis.
 * CAN FD frames (ISO 11898-1:2015) are in fd-frame-bits.ts, which shares the stuffing helpers below.
 */
import { crc15, crc15Step, crc15UpdateByte, CRC15_POLY } from './crc15';
import { MAX_EXTENDED_ID, MAX_STANDARD_ID } from './map';

/**
 * Intermission between frames: 3 recessive bits after EOF before the next SOF (ISO 11898-1).
 * Not part of a frame's own bit count, but it occupies the bus, so bus load adds it.
 */
export const interFrameBits = 3;

/** Largest classical payload. ISO 11898-1. */
export const CLASSICAL_MAX_LENGTH = 8;

/** Bits after the CRC sequence, never stuffed: CRC delimiter, ACK slot, ACK delimiter, 7 EOF. ISO 11898-1. */
export const TRAILER_BITS = 1 + 1 + 1 + 7;

/** Stuffed bits before the data field plus the 15-bit CRC (Davis et al. 2007 "g"): 34 base, 54 extended. */
export function stuffedControlBits(extended: boolean): number {
	return extended ? 54 : 34;
}

export interface FrameBitSequence {
	/** SOF through EOF, unstuffed, 0 = dominant, 1 = recessive (ACK slot as sent: recessive). */
	bits: Uint8Array;
	/** Bits [0, stuffedLength) — SOF through the end of the CRC sequence — are subject to stuffing. */
	stuffedLength: number;
	crc: number;
}

/** Throws a RangeError unless `id` fits the 11-bit (base) or 29-bit (extended) format. */
export function checkIdentifier(id: number, extended: boolean): void {
	const max = extended ? MAX_EXTENDED_ID : MAX_STANDARD_ID;
	if (!Number.isInteger(id) || id < 0 || id > max) {
		const kind = extended
			? 'an extended (29-bit) ID must be 0…0x1FFFFFFF'
			: 'a standard (11-bit) ID must be 0…0x7FF';
		throw new RangeError(`${kind}, got ${id}`);
	}
}

function checkFrame(id: number, extended: boolean, length: number): void {
	checkIdentifier(id, extended);
	if (length > CLASSICAL_MAX_LENGTH) {
		throw new RangeError(
			`classical CAN frames carry 0–8 data bytes, got ${length} (CAN FD frames are not modelled here)`
		);
	}
}

/**
 * Builds the bit sequence of a classical data frame (ISO 11898-1), most significant bit first:
 * base format: SOF, 11-bit ID, RTR=0, IDE=0, r0=0, DLC(4), data, CRC(15);
 * extended format: SOF, 11-bit base ID, SRR=1, IDE=1, 18-bit ID extension, RTR=0, r1=0, r0=0, DLC, data, CRC;
 * then CRC delimiter, ACK slot, ACK delimiter and 7 EOF bits, all recessive.
 */
export function frameBitSequence(
	id: number,
	extended: boolean,
	data: Uint8Array
): FrameBitSequence {
	checkFrame(id, extended, data.length);
	// Every field is at most 18 bits wide (the 29-bit ID goes out in 11 + 18), so 32-bit shifts are
	// exact; one scratch buffer and no closures keep this cheap enough to run for every frame of a
	// capture (bus load over time).
	const out = scratchBits;
	let n = putBits(out, 0, 0, 1); // SOF
	if (extended) {
		n = putBits(out, n, id >>> 18, 11); // base ID = the 11 most significant bits
		n = putBits(out, n, 1, 1); // SRR
		n = putBits(out, n, 1, 1); // IDE
		n = putBits(out, n, id & 0x3ffff, 18); // ID extension
		n = putBits(out, n, 0, 1); // RTR
		n = putBits(out, n, 0, 2); // r1, r0
	} else {
		n = putBits(out, n, id, 11);
		n = putBits(out, n, 0, 1); // RTR
		n = putBits(out, n, 0, 1); // IDE
		n = putBits(out, n, 0, 1); // r0
	}
	n = putBits(out, n, data.length, 4); // DLC: for 0–8 bytes the code equals the length
	for (let k = 0; k < data.length; k++) n = putBits(out, n, data[k], 8);
	const crc = crc15(out.subarray(0, n));
	n = putBits(out, n, crc, 15);
	const stuffedLength = n;
	n = putBits(out, n, 0b1111111111, TRAILER_BITS); // CRC delimiter, ACK slot, ACK delimiter, EOF
	return { bits: out.slice(0, n), stuffedLength, crc };
}

/** Room for the longest classical frame (extended, 8 bytes: 128 bits). */
const scratchBits = new Uint8Array(64 + 8 * CLASSICAL_MAX_LENGTH);

/** Writes `width` bits of `value`, most significant first, at out[n]; returns the next position. */
export function putBits(out: Uint8Array, n: number, value: number, width: number): number {
	for (let b = width - 1; b >= 0; b--) out[n++] = (value >>> b) & 1;
	return n;
}

/**
 * Stuff bits needed by a bit stream (ISO 11898-1): after 5 consecutive equal bits the sender
 * inserts one complementary bit, and that stuff bit counts towards the next run.
 */
export function countStuffBits(bits: ArrayLike<number>, end: number = bits.length): number {
	let count = 0;
	let last = -1;
	let run = 0;
	for (let i = 0; i < end; i++) {
		const bit = bits[i];
		if (bit === last) run++;
		else {
			last = bit;
			run = 1;
		}
		if (run === 5) {
			count++;
			last = 1 - bit;
			run = 1;
		}
	}
	return count;
}

/** The stuffed stream as sent on the wire (same rule as countStuffBits), for display and checks. */
export function applyStuffing(bits: ArrayLike<number>): Uint8Array {
	const out: number[] = [];
	let last = -1;
	let run = 0;
	for (let i = 0; i < bits.length; i++) {
		const bit = bits[i];
		out.push(bit);
		if (bit === last) run++;
		else {
			last = bit;
			run = 1;
		}
		if (run === 5) {
			out.push(1 - bit);
			last = 1 - bit;
			run = 1;
		}
	}
	return Uint8Array.from(out);
}

export interface FrameBits {
	/** SOF through EOF without stuffing: 44 + 8n base format, 64 + 8n extended. */
	bits: number;
	/** Stuff bits this exact frame needs (SOF through the CRC sequence). */
	stuffBits: number;
	crc: number;
}

/** Bit count, stuff bits and CRC-15 of one classical data frame (ISO 11898-1). */
export function frameBits(id: number, extended: boolean, data: Uint8Array): FrameBits {
	checkFrame(id, extended, data.length);
	const packed = stuffBitsAndCrc(id, extended, data, 0, data.length);
	return {
		bits: nominalFrameBits(data.length, extended),
		stuffBits: packed >>> 15,
		crc: packed & 0x7fff
	};
}

/**
 * Stuff bits of the frame whose payload is `bytes[offset … offset + length)` — the same count as
 * frameBits, without a payload view or any allocation, for running over every frame of a capture
 * straight from its payload pool.
 */
export function frameStuffBitsAt(
	id: number,
	extended: boolean,
	bytes: Uint8Array,
	offset: number,
	length: number
): number {
	checkFrame(id, extended, length);
	if (!Number.isInteger(offset) || offset < 0 || offset + length > bytes.length) {
		throw new RangeError(
			`payload bytes ${offset}…${offset + length} lie outside a pool of ${bytes.length} bytes`
		);
	}
	return stuffBitsAndCrc(id, extended, bytes, offset, length) >>> 15;
}

/*
 * Byte-wise path. The stretch SOF … data is 19 + 8n bits (base) or 39 + 8n (extended); putting
 * 5 or 1 pad bits in front makes it whole bytes with the payload byte-aligned, so the CRC can use
 * crc15UpdateByte and the stuffing rule a table of (run state, byte) — one lookup per byte each.
 * The pad is chosen per use so that it changes nothing:
 * - CRC: zeros. With the register initialised to 0, leading zeros leave it at 0 (ISO 11898-1 CRC).
 * - stuffing: "10101" (base) or "1" (extended) from the state "last 0, run 1" — no run reaches 5,
 *   and it ends on a recessive bit, so the dominant SOF starts a fresh run as on an idle bus.
 * The 15 CRC bits close the stuffed stretch: one byte, then 7 bits padded with the complement of
 * the last one, which can neither complete a run nor follow a stuff bit into one.
 */

/** Stuffing state = last << 2 | (run − 1), run 1…4 (a run of 5 is stuffed at once): 8 states. */
export const STUFF_START = 0; // last 0, run 1
const STUFF_PAD_BASE = 0b10101000;
const STUFF_PAD_EXTENDED = 0b10000000;

/**
 * STUFF_TABLE[state << 8 | byte] = new state << 2 | stuff bits inserted in that byte (0–2), the byte
 * taken most significant bit first; a run of 5 ending on the byte's last bit is stuffed (counted) too.
 */
export const STUFF_TABLE = (() => {
	const table = new Uint8Array(8 << 8);
	for (let state = 0; state < 8; state++) {
		for (let byte = 0; byte < 256; byte++) {
			let last = state >> 2;
			let run = (state & 3) + 1;
			let stuffed = 0;
			for (let b = 7; b >= 0; b--) {
				const r = advance(last, run, (byte >> b) & 1);
				({ last, run } = r);
				stuffed += r.stuffed;
			}
			table[(state << 8) | byte] = (((last << 2) | (run - 1)) << 2) | stuffed;
		}
	}
	return table;
})();

/** Scratch for the padded header: 3 bytes base format, 5 extended. */
const headerBytes = new Uint8Array(5);

/**
 * Writes SOF … DLC, with zero pad bits in front, into headerBytes; returns how many bytes.
 * Storing into a Uint8Array keeps the low 8 bits, so wider shifts need no mask.
 */
function putHeader(id: number, extended: boolean, length: number): number {
	// DLC: for 0–8 bytes the code equals the length (ISO 11898-1).
	if (extended) {
		const base = id >>> 18;
		const ext = id & 0x3ffff;
		// [pad, SOF, base 10…5] [base 4…0, SRR=1, IDE=1, ext 17] [ext 16…9] [ext 8…1] [ext 0, RTR, r1, r0, DLC]
		headerBytes[0] = base >>> 5;
		headerBytes[1] = ((base & 0x1f) << 3) | 0b110 | (ext >>> 17);
		headerBytes[2] = ext >>> 9;
		headerBytes[3] = ext >>> 1;
		headerBytes[4] = ((ext & 1) << 7) | length;
		return 5;
	}
	// [pad×5, SOF, ID 10, ID 9] [ID 8…1] [ID 0, RTR, IDE, r0, DLC]
	headerBytes[0] = id >>> 9;
	headerBytes[1] = id >>> 1;
	headerBytes[2] = ((id & 1) << 7) | length;
	return 3;
}

/** (stuff bits << 15) | CRC-15 of a checked classical frame; see the comment above for the method. */
function stuffBitsAndCrc(
	id: number,
	extended: boolean,
	bytes: Uint8Array,
	offset: number,
	length: number
): number {
	const headerLength = putHeader(id, extended, length);
	let crc = 0;
	let stuff = 0;
	// The first header byte carries the pad: zeros for the CRC, the stuffing pad for the run count.
	let v =
		STUFF_TABLE[
			(STUFF_START << 8) | headerBytes[0] | (extended ? STUFF_PAD_EXTENDED : STUFF_PAD_BASE)
		];
	crc = crc15UpdateByte(crc, headerBytes[0]);
	stuff += v & 3;
	for (let k = 1; k < headerLength; k++) {
		const byte = headerBytes[k];
		crc = crc15UpdateByte(crc, byte);
		v = STUFF_TABLE[((v >> 2) << 8) | byte];
		stuff += v & 3;
	}
	for (let k = offset, end = offset + length; k < end; k++) {
		const byte = bytes[k];
		crc = crc15UpdateByte(crc, byte);
		v = STUFF_TABLE[((v >> 2) << 8) | byte];
		stuff += v & 3;
	}
	// CRC sequence: bits 14…7, then 6…0 followed by the complement of bit 0 (adds no stuff bit).
	v = STUFF_TABLE[((v >> 2) << 8) | (crc >>> 7)];
	stuff += v & 3;
	v = STUFF_TABLE[((v >> 2) << 8) | ((crc & 0x7f) << 1) | ((crc & 1) ^ 1)];
	stuff += v & 3;
	return (stuff << 15) | crc;
}

/**
 * Worst-case bus time of a classical data frame in bits, Davis, Burns, Bril and Lukkien,
 * "Controller Area Network (CAN) schedulability analysis: refuted, revisited and revised",
 * Real-Time Systems 35 (2007), eq. (1):  C = g + 8n + 13 + ⌊(g + 8n − 1) / 4⌋,
 * g = 34 (base) or 54 (extended) stuffed control bits, 13 = the never-stuffed CRC delimiter,
 * ACK slot, ACK delimiter, 7 EOF bits AND the 3-bit intermission. So the result already includes
 * interFrameBits: 135 for 8 bytes base format (132 frame bits + 3), 160 extended.
 * The stuff term assumes a stuff bit after the first 5 bits and then after every 4.
 */
export function worstCaseFrameBits(length: number, extended: boolean): number {
	if (!Number.isInteger(length) || length < 0 || length > CLASSICAL_MAX_LENGTH) {
		throw new RangeError(
			`worst-case length is defined for 0–8 data bytes (classical CAN), got ${length}`
		);
	}
	const stuffed = stuffedControlBits(extended) + 8 * length;
	return stuffed + TRAILER_BITS + interFrameBits + Math.floor((stuffed - 1) / 4);
}

/** Unstuffed bits of a classical frame, SOF through EOF (44 + 8n or 64 + 8n). ISO 11898-1. */
export function nominalFrameBits(length: number, extended: boolean): number {
	return stuffedControlBits(extended) + 8 * length + TRAILER_BITS;
}

export interface StuffingWitness {
	/** Largest number of stuff bits any frame of this shape can need. */
	stuffBits: number;
	/** A frame that needs exactly that many. */
	id: number;
	data: Uint8Array;
}

/**
 * Exact worst-case stuffing of classical frames with `length` data bytes, over every payload and —
 * unless `id` is given — every identifier, with a frame that reaches it. Unlike the Davis bound
 * (which assumes every bit free), this respects the fixed control bits and the CRC that the
 * payload determines. Dynamic programming over (last bit, run length, CRC register): at most
 * 2 × 4 × 2^15 states per bit, about 0.1–2 s per call, so it is an analysis tool, not a hot path.
 *
 * What it shows (computed with this function, confirmed by exhaustive search for 0–2 bytes in the
 * tests): the Davis bound is never reached. Exact maxima, base format n = 0…8 bytes:
 * 6, 7, 9, 12, 14, 15, 18, 21, 22 stuff bits (bound ⌊(33 + 8n)/4⌋: 8 … 24); extended: 11, 13, 15,
 * 17, 19, 21, 23, 25, 27 (bound 13 … 29). Why: the bound needs a stuff bit after the first 5 bits
 * and then every 4, i.e. runs of exactly 4 equal bits in lock-step across the whole field, but the
 * fixed bits (RTR, IDE, r0 = 000 in base format; SRR, IDE = 11 and RTR, r1, r0 = 000 extended) and
 * the DLC sit at fixed places that break that rhythm, and the 15 CRC bits are dictated by the rest.
 * So an 8-byte base frame takes at most 108 + 22 + 3 = 133 bus bits, not 135.
 */
export function maxStuffBits(length: number, extended: boolean, id?: number): StuffingWitness {
	if (!Number.isInteger(length) || length < 0 || length > CLASSICAL_MAX_LENGTH) {
		throw new RangeError(`length must be 0–8 data bytes (classical CAN), got ${length}`);
	}
	// Template of SOF…data: 0/1 fixed, -1 free; the ID bit positions are remembered to rebuild it.
	const probe = frameBitSequence(id ?? 0, extended, new Uint8Array(length));
	const prefix = Array.from(probe.bits.subarray(0, probe.stuffedLength - 15));
	const idPositions = extended
		? [...range(1, 12), ...range(14, 32)] // base ID, then (after SRR, IDE) the 18-bit extension
		: range(1, 12);
	const dataStart = prefix.length - 8 * length;
	if (id === undefined) for (const p of idPositions) prefix[p] = -1;
	for (let p = dataStart; p < prefix.length; p++) prefix[p] = -1;

	// State = crc << 3 | last << 2 | (run − 1); run is 1…4 because a run of 5 is stuffed at once.
	const STATES = 1 << 18;
	let best = new Int16Array(STATES).fill(-1);
	best[(crc15Step(0, 0) << 3) | 0] = 0; // after SOF (dominant): last 0, run 1
	// choice[layer][state]: the bit taken into `state` and the predecessor's (last, run − 1).
	const choices: Uint8Array[] = [];
	for (let p = 1; p < prefix.length; p++) {
		const next = new Int16Array(STATES).fill(-1);
		const choice = new Uint8Array(STATES);
		const options = prefix[p] === -1 ? [0, 1] : [prefix[p]];
		for (let s = 0; s < STATES; s++) {
			const v = best[s];
			if (v < 0) continue;
			const crc = s >> 3;
			const last = (s >> 2) & 1;
			const run = (s & 3) + 1;
			for (const bit of options) {
				const r = advance(last, run, bit);
				const t = (crc15Step(crc, bit) << 3) | (r.last << 2) | (r.run - 1);
				if (v + r.stuffed > next[t]) {
					next[t] = v + r.stuffed;
					choice[t] = (bit << 3) | (s & 7);
				}
			}
		}
		choices.push(choice);
		best = next;
	}
	// The CRC sequence follows from the state; finish the count through its 15 bits.
	let top = -1;
	let topState = -1;
	for (let s = 0; s < STATES; s++) {
		if (best[s] < 0) continue;
		let last = (s >> 2) & 1;
		let run = (s & 3) + 1;
		let total = best[s];
		const crc = s >> 3;
		for (let b = 14; b >= 0; b--) {
			const r = advance(last, run, (crc >> b) & 1);
			({ last, run } = r);
			total += r.stuffed;
		}
		if (total > top) {
			top = total;
			topState = s;
		}
	}
	// Walk the choices back to the bits of SOF…data, then read the ID and payload out of them.
	const bits = new Array<number>(prefix.length).fill(0);
	let s = topState;
	for (let p = prefix.length - 1; p >= 1; p--) {
		const c = choices[p - 1][s];
		const bit = c >> 3;
		bits[p] = bit;
		s = (crc15Unstep(s >> 3, bit) << 3) | (c & 7);
	}
	const foundId = idPositions.reduce((acc, p) => acc * 2 + bits[p], 0);
	const data = Uint8Array.from({ length }, (_, i) =>
		bits.slice(dataStart + 8 * i, dataStart + 8 * i + 8).reduce((acc, b) => acc * 2 + b, 0)
	);
	return { stuffBits: top, id: id ?? foundId, data };
}

function range(from: number, to: number): number[] {
	return Array.from({ length: to - from }, (_, i) => from + i);
}

/** One bit of the stuffing rule: the new run state and whether a stuff bit follows. */
export function advance(
	last: number,
	run: number,
	bit: number
): { last: number; run: number; stuffed: number } {
	const r = bit === last ? run + 1 : 1;
	return r === 5 ? { last: 1 - bit, run: 1, stuffed: 1 } : { last: bit, run: r, stuffed: 0 };
}

/** Inverse of crc15Step: the register before `bit` was shifted in (the generator's x^0 term is 1). */
function crc15Unstep(crc: number, bit: number): number {
	const feedback = crc & 1;
	const shifted = feedback ? crc ^ CRC15_POLY : crc;
	return (shifted >> 1) | ((feedback ^ bit) << 14);
}
