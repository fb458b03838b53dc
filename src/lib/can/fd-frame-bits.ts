/**
 * Bit-level layout of CAN FD data frames (ISO 11898-1:2015): bit counts with dynamic and fixed stuff
 * bits, the stuff count, CRC-17 / CRC-21, and how many bits go at the nominal (arbitration) bit rate
 * and how many at the data bit rate — for bus load and frame timing. Classical frames: frame-bits.ts.
 *
 * Field by field, most significant bit first (0 = dominant, 1 = recessive):
 *   base format      SOF, ID(11), RRS=0, IDE=0, FDF=1, res=0, BRS, ESI=0, DLC(4)          22 bits
 *   extended format  SOF, base ID(11), SRR=1, IDE=1, ID extension(18), RRS=0, FDF=1, res=0,
 *                    BRS, ESI=0, DLC(4)                                                      41 bits
 *   data field       0–64 bytes (DLC 9–15 mean 12…64 bytes, dlc.ts)
 *   — dynamic stuffing (a complement after 5 equal bits) covers SOF through the data field,
 *     including a stuff bit that a run ending on the last data bit calls for —
 *   stuff count      3-bit Gray code of (dynamic stuff bits mod 8), then an even-parity bit
 *   CRC sequence     17 bits (≤ 16 data bytes) or 21 bits (more)
 *   — fixed stuffing: one stuff bit before the stuff count and one after every 4th bit of the
 *     stuff count + CRC sequence, each the complement of the bit before it: 6 (CRC-17) or 7 (CRC-21) —
 *   CRC delimiter=1, ACK slot (sent recessive), ACK delimiter=1, EOF=1111111               10 bits
 * The CRC register is preset to "1 0…0" and takes SOF … data field with its dynamic stuff bits, then
 * the stuff count; fixed stuff bits are not part of it.
 * ESI is taken dominant (an error-active sender, the normal case); BRS recessive when the bit rate
 * switches. The rule details marked above come from ISO 11898-1:2015 as recalled (from memory).
 *
 * Bit rates: with BRS, the rate switches at the sample point of BRS and back at the sample point of
 * the CRC delimiter. Whatever the sample points, BRS and the delimiter together last one nominal
 * bit plus one data bit (the part of each bit before and after its switch adds up), so counting BRS
 * at the nominal rate and the delimiter at the data rate gives the exact frame duration:
 *   arbitration phase (nominal rate): SOF … BRS with the stuff bits inserted before BRS,
 *                                     then ACK slot, ACK delimiter, EOF
 *   data phase (data rate):           ESI … CRC delimiter with every other stuff bit
 * Without BRS the whole frame goes at the nominal rate (dataPhaseBits = 0).
 */
import { fdCrcFor, fdFrameCrcInit } from './crc-fd';
import { dlcToLength, MAX_PAYLOAD_LENGTH } from './dlc';
import { checkIdentifier, putBits, STUFF_START, STUFF_TABLE, TRAILER_BITS } from './frame-bits';

/** Bits of the stuff count field: 3 Gray-coded bits and a parity bit. ISO 11898-1:2015. */
export const STUFF_COUNT_BITS = 4;
/** ACK slot, ACK delimiter and 7 EOF bits: after the CRC delimiter, at the nominal rate again. */
const ACK_AND_EOF_BITS = TRAILER_BITS - 1;

/** SOF through DLC, unstuffed: 22 base format, 41 extended. */
export function fdHeaderBits(extended: boolean): number {
	return extended ? 41 : 22;
}

/** SOF through BRS (the bits before the switch to the data rate): 17 base, 36 extended. */
function arbitrationHeaderBits(extended: boolean): number {
	return fdHeaderBits(extended) - 5; // ESI and the 4 DLC bits follow BRS
}

/** Fixed stuff bits of the CRC field: one before the stuff count, one after every 4th bit after it. */
export function fdFixedStuffBits(crcWidth: number): number {
	return 1 + Math.floor((STUFF_COUNT_BITS + crcWidth - 1) / 4);
}

/** DLC of each payload length an FD frame can have, −1 for the others (ISO 11898-1 DLC table). */
const DLC_OF_LENGTH = (() => {
	const table = new Int8Array(MAX_PAYLOAD_LENGTH + 1).fill(-1);
	for (let dlc = 0; dlc <= 15; dlc++) table[dlcToLength(dlc)] = dlc;
	return table;
})();

/** Throws a RangeError unless `length` is a payload a CAN FD frame can carry (0–8, 12, 16, 20, 24, 32, 48, 64). */
export function checkFdLength(length: number): void {
	if (
		!Number.isInteger(length) ||
		length < 0 ||
		length > MAX_PAYLOAD_LENGTH ||
		DLC_OF_LENGTH[length] < 0
	) {
		throw new RangeError(
			`a CAN FD frame carries 0–8, 12, 16, 20, 24, 32, 48 or 64 data bytes, got ${length}`
		);
	}
}

export interface FdPhaseBits {
	/** Bits at the nominal bit rate. */
	arbitrationBits: number;
	/** Bits at the data bit rate (0 without bit rate switch). */
	dataPhaseBits: number;
}

export interface FdFrameBits extends FdPhaseBits {
	/** SOF through EOF without any stuff bits: 53 + 8n (base) or 72 + 8n (extended) with CRC-17, 4 more with CRC-21. */
	bits: number;
	/** Dynamic stuff bits (SOF through the data field) — the ones the stuff count counts. */
	stuffBits: number;
	/** Fixed stuff bits of the CRC field: 6 with CRC-17, 7 with CRC-21. */
	fixedStuffBits: number;
	/** The stuff count field's value before Gray coding: stuffBits mod 8. */
	stuffCount: number;
	crcWidth: 17 | 21;
	crc: number;
}

export interface FdFrameOptions {
	/** BRS recessive: the data phase runs at the data bit rate. */
	bitRateSwitch: boolean;
}

/** Room for SOF … data of the longest FD frame (extended, 64 bytes). */
const scratchBits = new Uint8Array(41 + 8 * MAX_PAYLOAD_LENGTH);

/** Writes SOF … DLC of an FD data frame into `out`; returns the number of bits. */
function putFdHeader(
	out: Uint8Array,
	id: number,
	extended: boolean,
	length: number,
	brs: boolean
): number {
	let n = putBits(out, 0, 0, 1); // SOF
	if (extended) {
		n = putBits(out, n, id >>> 18, 11); // base ID = the 11 most significant bits
		n = putBits(out, n, 0b11, 2); // SRR, IDE
		n = putBits(out, n, id & 0x3ffff, 18); // ID extension
		n = putBits(out, n, 0, 1); // RRS
	} else {
		n = putBits(out, n, id, 11);
		n = putBits(out, n, 0b00, 2); // RRS, IDE
	}
	n = putBits(out, n, brs ? 0b1010 : 0b1000, 4); // FDF=1, res=0, BRS, ESI=0
	return putBits(out, n, DLC_OF_LENGTH[length], 4); // DLC
}

/** Bits of a frame of this shape that do not depend on its content. */
function fixedCounts(length: number, extended: boolean) {
	const crcWidth = fdCrcFor(length).width;
	return {
		crcWidth,
		bits: fdHeaderBits(extended) + 8 * length + STUFF_COUNT_BITS + crcWidth + TRAILER_BITS,
		fixedStuffBits: fdFixedStuffBits(crcWidth)
	};
}

function phases(
	wireBits: number,
	extended: boolean,
	stuffBeforeBrs: number,
	brs: boolean
): FdPhaseBits {
	if (!brs) return { arbitrationBits: wireBits, dataPhaseBits: 0 };
	const arbitrationBits = arbitrationHeaderBits(extended) + stuffBeforeBrs + ACK_AND_EOF_BITS;
	return { arbitrationBits, dataPhaseBits: wireBits - arbitrationBits };
}

/**
 * Bit counts, stuff count and CRC of one CAN FD data frame (ISO 11898-1:2015, layout above).
 * Walks the frame bit by bit, as the CRC covers the dynamic stuff bits.
 */
export function fdFrameBits(
	id: number,
	extended: boolean,
	data: Uint8Array,
	options: FdFrameOptions
): FdFrameBits {
	checkIdentifier(id, extended);
	checkFdLength(data.length);
	const brs = options.bitRateSwitch;
	const out = scratchBits;
	let n = putFdHeader(out, id, extended, data.length, brs);
	for (let k = 0; k < data.length; k++) n = putBits(out, n, data[k], 8);
	const crcKind = fdCrcFor(data.length);
	const brsIndex = arbitrationHeaderBits(extended) - 1;
	let crc = fdFrameCrcInit(crcKind);
	let last = 1; // idle bus: the dominant SOF starts a fresh run
	let run = 0;
	let stuffBits = 0;
	let stuffBeforeBrs = 0;
	for (let i = 0; i < n; i++) {
		const bit = out[i];
		crc = crcKind.step(crc, bit);
		if (bit === last) run++;
		else {
			last = bit;
			run = 1;
		}
		if (run === 5) {
			// The complement is sent, counts towards the next run and goes into the CRC.
			stuffBits++;
			if (i < brsIndex) stuffBeforeBrs++;
			last = 1 - bit;
			run = 1;
			crc = crcKind.step(crc, last);
		}
	}
	const stuffCount = stuffBits & 7;
	const gray = stuffCount ^ (stuffCount >> 1);
	const parity = (gray ^ (gray >> 1) ^ (gray >> 2)) & 1; // even parity over the 3 Gray bits
	for (const bit of [(gray >> 2) & 1, (gray >> 1) & 1, gray & 1, parity]) {
		crc = crcKind.step(crc, bit);
	}
	const fixed = fixedCounts(data.length, extended);
	const wire = fixed.bits + stuffBits + fixed.fixedStuffBits;
	return {
		...phases(wire, extended, stuffBeforeBrs, brs),
		bits: fixed.bits,
		stuffBits,
		fixedStuffBits: fixed.fixedStuffBits,
		stuffCount,
		crcWidth: fixed.crcWidth,
		crc
	};
}

/**
 * The phase bit counts of fdFrameBits for the frame whose payload is `bytes[offset … offset + length)`
 * (a capture's payload pool), without the CRC, which the bit count does not depend on (the CRC
 * field has fixed stuffing). Fast enough to run for every FD frame of a capture: the bits up to
 * BRS are packed into whole bytes and, like the payload, counted through frame-bits.ts' stuffing
 * table a byte at a time; only BRS, ESI and the DLC go bit by bit.
 */
export function fdPhaseBitsAt(
	id: number,
	extended: boolean,
	bytes: Uint8Array,
	offset: number,
	length: number,
	options: FdFrameOptions
): FdPhaseBits {
	checkIdentifier(id, extended);
	checkFdLength(length);
	if (!Number.isInteger(offset) || offset < 0 || offset + length > bytes.length) {
		throw new RangeError(
			`payload bytes ${offset}…${offset + length} lie outside a pool of ${bytes.length} bytes`
		);
	}
	const table = STUFF_TABLE; // one read of the imported binding, not one per byte
	const brs = options.bitRateSwitch;
	// SOF … res, padded in front to whole bytes. Stuffing state = last << 2 | (run − 1).
	let state: number;
	let stuffBits = 0;
	const header = headerBytes;
	let headerLength: number;
	if (extended) {
		// Pad "10101" from the state "last 0, run 1": no run reaches 5 and it ends recessive, so the
		// dominant SOF starts a fresh run as after an idle bus (the same pad as frame-bits.ts).
		const base = id >>> 18;
		const ext = id & 0x3ffff;
		// [pad×5, SOF, base 10…9] [base 8…1] [base 0, SRR=1, IDE=1, ext 17…13] [ext 12…5] [ext 4…0, RRS=0, FDF=1, res=0]
		header[0] = 0b10101000 | (base >>> 9);
		header[1] = base >>> 1;
		header[2] = ((base & 1) << 7) | 0b1100000 | (ext >>> 13);
		header[3] = ext >>> 5;
		header[4] = ((ext & 0x1f) << 3) | 0b010;
		headerLength = 5;
		state = STUFF_START;
	} else {
		// [SOF, ID 10…4] [ID 3…0, RRS=0, IDE=0, FDF=1, res=0], from "last recessive, run 1".
		header[0] = id >>> 4;
		header[1] = ((id & 0xf) << 4) | 0b0010;
		headerLength = 2;
		state = 0b100;
	}
	for (let k = 0; k < headerLength; k++) {
		const v = table[(state << 8) | header[k]];
		stuffBits += v & 3;
		state = v >> 2;
	}
	const stuffBeforeBrs = stuffBits;
	// BRS, ESI=0, DLC(4).
	const tail = (brs ? 0b100000 : 0) | DLC_OF_LENGTH[length];
	let last = state >> 2;
	let run = (state & 3) + 1;
	for (let b = 5; b >= 0; b--) {
		const bit = (tail >> b) & 1;
		if (bit === last) run++;
		else {
			last = bit;
			run = 1;
		}
		if (run === 5) {
			stuffBits++;
			last = 1 - bit;
			run = 1;
		}
	}
	state = (last << 2) | (run - 1);
	for (let k = offset, end = offset + length; k < end; k++) {
		const v = table[(state << 8) | bytes[k]];
		stuffBits += v & 3;
		state = v >> 2;
	}
	const fixed = fixedCounts(length, extended);
	return phases(fixed.bits + stuffBits + fixed.fixedStuffBits, extended, stuffBeforeBrs, brs);
}

/** Scratch for fdPhaseBitsAt's packed header (at most 5 bytes). */
const headerBytes = new Uint8Array(5);

/**
 * Phase bits of an FD frame of this shape without dynamic stuff bits (fixed stuff bits included,
 * as every frame has them): the floor for planning, like nominalFrameBits for classical frames.
 * Excludes the 3-bit intermission.
 */
export function fdNominalPhaseBits(
	length: number,
	extended: boolean,
	options: FdFrameOptions
): FdPhaseBits {
	checkFdLength(length);
	const fixed = fixedCounts(length, extended);
	return phases(fixed.bits + fixed.fixedStuffBits, extended, 0, options.bitRateSwitch);
}

/**
 * Upper bound on the phase bits of an FD frame of this shape, excluding the intermission. The
 * counting argument of Davis et al. (2007) for classical frames: in a stretch of L bits the first
 * stuff bit needs 5 bits and each further one 4 more, so at most ⌊(L − 1)/4⌋ stuff bits — here over
 * SOF … data field (22 + 8n or 41 + 8n bits). As many as fit are placed before BRS (SOF … res:
 * 16 or 35 bits, so at most 3 or 8), where a bit lasts longest; the bound holds whenever the data
 * bit rate is at least the nominal one.
 */
export function fdWorstCasePhaseBits(
	length: number,
	extended: boolean,
	options: FdFrameOptions
): FdPhaseBits {
	checkFdLength(length);
	const fixed = fixedCounts(length, extended);
	const stretch = fdHeaderBits(extended) + 8 * length;
	const maxStuff = Math.floor((stretch - 1) / 4);
	const beforeBrs = arbitrationHeaderBits(extended) - 1; // SOF … res
	const maxBeforeBrs = Math.floor((beforeBrs - 1) / 4);
	return phases(
		fixed.bits + fixed.fixedStuffBits + maxStuff,
		extended,
		maxBeforeBrs,
		options.bitRateSwitch
	);
}

/** Seconds the bits take: arbitration phase at the nominal rate, data phase at the data rate. */
export function fdFrameSeconds(
	bits: FdPhaseBits,
	nominalBitrate: number,
	dataBitrate: number
): number {
	return bits.arbitrationBits / nominalBitrate + bits.dataPhaseBits / dataBitrate;
}
