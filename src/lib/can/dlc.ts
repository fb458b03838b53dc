/**
 * Data length code ↔ payload byte count.
 * ISO 11898-1: DLC 0–8 mean 0–8 bytes; CAN FD DLC 9–15 mean 12, 16, 20, 24, 32, 48, 64 bytes.
 * (Classical CAN treats DLC 9–15 as 8 bytes; this module follows the FD meaning the capture format uses.)
 */

/** Payload bytes for DLC 0…15 (ISO 11898-1 CAN FD table). */
const LENGTH_OF_DLC = [0, 1, 2, 3, 4, 5, 6, 7, 8, 12, 16, 20, 24, 32, 48, 64] as const;

/** The largest payload a CAN FD frame can carry (ISO 11898-1). */
export const MAX_PAYLOAD_LENGTH = 64;

export function dlcToLength(dlc: number): number {
	if (!Number.isInteger(dlc) || dlc < 0 || dlc > 15) {
		throw new RangeError(`DLC must be a whole number from 0 to 15, got ${dlc}`);
	}
	return LENGTH_OF_DLC[dlc];
}

/** Smallest DLC whose payload holds `len` bytes (a frame is padded up to that length). */
export function lengthToDlc(len: number): number {
	if (!Number.isInteger(len) || len < 0 || len > MAX_PAYLOAD_LENGTH) {
		throw new RangeError(`payload length must be a whole number from 0 to 64 bytes, got ${len}`);
	}
	return LENGTH_OF_DLC.findIndex((n) => n >= len);
}
