/**
 * CRC-17 and CRC-21 of CAN FD frames (ISO 11898-1:2015): CRC-17 protects frames with up to 16 data
 * bytes, CRC-21 longer ones. Both are plain MSB-first shift registers like CRC-15 (crc15.ts):
 * - CRC-17: x^17 + x^16 + x^14 + x^13 + x^11 + x^6 + x^4 + x^3 + x + 1 → 0x1685B without the x^17 term
 * - CRC-21: x^21 + x^20 + x^13 + x^11 + x^7 + x^4 + x^3 + 1 → 0x102899 without the x^21 term
 * The CRC catalogue lists them with init 0, no reflection and no final XOR ("CRC-17/CAN-FD",
 * "CRC-21/CAN-FD"); inside a frame ISO 11898-1:2015 presets the register with a 1 in its top bit
 * (fdFrameCrcInit), see fd-frame-bits.ts.
 */

export interface FdCrc {
	readonly width: 17 | 21;
	/** Generator polynomial without its x^width term. */
	readonly poly: number;
	/** Shifts one bit into the register (the ISO 11898-1 CRC procedure). */
	step(crc: number, bit: number): number;
	/** Eight `step` calls in one: shifts `byte` in, most significant bit first. */
	updateByte(crc: number, byte: number): number;
	/** CRC over bits (each 0 or 1), first bit first. */
	ofBits(bits: ArrayLike<number>, init?: number): number;
	/** CRC over whole bytes, most significant bit of each byte first. */
	ofBytes(bytes: ArrayLike<number>, init?: number): number;
}

function fdCrc(width: 17 | 21, poly: number): FdCrc {
	const mask = 2 ** width - 1;
	const top = width - 1;
	const step = (crc: number, bit: number): number => {
		const feedback = (bit & 1) ^ ((crc >>> top) & 1);
		crc = (crc << 1) & mask;
		return feedback ? crc ^ poly : crc;
	};
	// The usual byte-wise table of an unreflected CRC, built from `step` itself so both paths agree.
	const table = Uint32Array.from({ length: 256 }, (_, b) => {
		let crc = b << (width - 8);
		for (let k = 0; k < 8; k++) crc = step(crc, 0);
		return crc;
	});
	const updateByte = (crc: number, byte: number): number =>
		((crc << 8) & mask) ^ table[((crc >>> (width - 8)) ^ byte) & 0xff];
	return {
		width,
		poly,
		step,
		updateByte,
		ofBits(bits, init = 0) {
			let crc = init;
			for (let i = 0; i < bits.length; i++) crc = step(crc, bits[i]);
			return crc;
		},
		ofBytes(bytes, init = 0) {
			let crc = init;
			for (let i = 0; i < bytes.length; i++) crc = updateByte(crc, bytes[i]);
			return crc;
		}
	};
}

/** CRC-17 of CAN FD frames with 0–16 data bytes. ISO 11898-1:2015. */
export const CRC17 = fdCrc(17, 0x1685b);
/** CRC-21 of CAN FD frames with 20–64 data bytes. ISO 11898-1:2015. */
export const CRC21 = fdCrc(21, 0x102899);

/** The CRC an FD frame with `length` data bytes carries: CRC-17 up to 16 bytes, CRC-21 beyond. */
export function fdCrcFor(length: number): FdCrc {
	return length <= 16 ? CRC17 : CRC21;
}

/**
 * Register preset inside an FD frame: a 1 in the top bit, zeros below ("1 0000 … 0"), ISO
 * 11898-1:2015 (from memory). Classical CAN presets CRC-15 to 0.
 */
export function fdFrameCrcInit(crc: FdCrc): number {
	return 2 ** (crc.width - 1);
}
