/**
 * Slow bit-by-bit reference for CAN FD frames (fd-frame-bits.ts), used only by tests: written from
 * the ISO 11898-1:2015 frame layout on '0'/'1' strings, sharing no code with the library.
 */

/** ISO 11898-1 CAN FD DLC table: code k means FD_LENGTHS[k] data bytes (0–8, then 12 … 64). */
export const FD_LENGTHS = [0, 1, 2, 3, 4, 5, 6, 7, 8, 12, 16, 20, 24, 32, 48, 64];

/** Generator polynomials of ISO 11898-1:2015 as x-exponents (from memory; see crc-fd.test.ts). */
const GENERATOR = {
	17: [17, 16, 14, 13, 11, 6, 4, 3, 1, 0],
	21: [21, 20, 13, 11, 7, 4, 3, 0]
} as const;

/** Remainder of a BigInt polynomial over GF(2) divided by the generator: plain long division. */
function mod2(value: bigint, width: 17 | 21): bigint {
	const g = GENERATOR[width].reduce((acc, e) => acc | (1n << BigInt(e)), 0n);
	for (let shift = BigInt(value.toString(2).length - 1); shift >= BigInt(width); shift--) {
		if ((value >> shift) & 1n) value ^= g << (shift - BigInt(width));
	}
	return value;
}

const flip = (bit: string) => (bit === '0' ? '1' : '0');

/**
 * The frame written from the ISO 11898-1:2015 FD frame layout, on '0'/'1' strings:
 * each field spelled out, dynamic stuffing over SOF … data, the stuff count (Gray code from its
 * table, even parity), the CRC as polynomial division (register preset "1 0…0" = the term
 * x^(w−1) · x^len added to M(x) · x^w, from memory), fixed stuff bits before the stuff count and
 * after every 4th bit of the CRC field, then delimiter, ACK and EOF. Phases are read off the
 * finished wire string: nominal rate through BRS and after the CRC delimiter.
 */
export function referenceFdFrame(id: number, extended: boolean, data: Uint8Array, brs: boolean) {
	const field = (value: number, width: number) => value.toString(2).padStart(width, '0');
	const arbitration = extended
		? // SOF, base ID (top 11 bits), SRR=1, IDE=1, 18-bit ID extension, RRS=0
			'0' + field(Math.floor(id / 2 ** 18), 11) + '1' + '1' + field(id % 2 ** 18, 18) + '0'
		: // SOF, 11-bit ID, RRS=0, IDE=0
			'0' + field(id, 11) + '0' + '0';
	// FDF=1, res=0, BRS, ESI=0 (error active), DLC
	const control = '1' + '0' + (brs ? '1' : '0') + '0' + field(FD_LENGTHS.indexOf(data.length), 4);
	const payload = Array.from(data, (b) => field(b, 8)).join('');
	const unstuffed = arbitration + control + payload;
	const brsPosition = arbitration.length + 2;

	let wire = '';
	let brsIndex = -1;
	let run = 0;
	let last = '';
	let stuffBits = 0;
	let stuffedAtEnd = false;
	for (let i = 0; i < unstuffed.length; i++) {
		if (i === brsPosition) brsIndex = wire.length;
		const bit = unstuffed[i];
		wire += bit;
		run = bit === last ? run + 1 : 1;
		last = bit;
		if (run === 5) {
			wire += flip(bit);
			stuffBits++;
			last = flip(bit);
			run = 1;
			stuffedAtEnd = i === unstuffed.length - 1;
		}
	}

	// Stuff count: Gray code table of ISO 11898-1:2015 (from memory), then even parity.
	const GRAY = ['000', '001', '011', '010', '110', '111', '101', '100'];
	const gray = GRAY[stuffBits % 8];
	const parity = [...gray].filter((c) => c === '1').length % 2 === 0 ? '0' : '1';
	const stuffCountField = gray + parity;

	const width = data.length <= 16 ? 17 : 21;
	const message = wire + stuffCountField;
	const preset = 1n << BigInt(width - 1 + message.length);
	const crc = Number(mod2(preset ^ (BigInt('0b' + message) << BigInt(width)), width));

	const crcField = stuffCountField + field(crc, width);
	let fixedPart = '';
	let previous = wire[wire.length - 1];
	let fixedStuffBits = 0;
	for (let i = 0; i < crcField.length; i++) {
		if (i % 4 === 0) {
			fixedPart += flip(previous);
			fixedStuffBits++;
		}
		fixedPart += crcField[i];
		previous = fixedPart[fixedPart.length - 1];
	}
	const delimiterIndex = wire.length + fixedPart.length;
	const full = wire + fixedPart + '1' + '1' + '1' + '1111111'; // CRC delimiter, ACK slot, ACK delimiter, EOF
	return {
		bits: unstuffed.length + 4 + width + 10,
		stuffBits,
		fixedStuffBits,
		stuffCount: stuffBits % 8,
		crcWidth: width,
		crc,
		arbitrationBits: brs ? brsIndex + 1 + (full.length - delimiterIndex - 1) : full.length,
		dataPhaseBits: brs ? delimiterIndex - brsIndex : 0,
		wire: full,
		dynamicEnd: wire.length,
		brsIndex,
		delimiterIndex,
		stuffedAtEnd
	};
}
