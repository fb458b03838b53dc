/**
 * CRC-8 over bytes, MSB first (refin = refout = false), table-driven. The two parameter sets are the
 * ones frame checksums commonly use: the SAE J1850 polynomial and the AUTOSAR "8H2F" polynomial.
 */

export interface Crc8Parameters {
	poly: number;
	init: number;
	xorout: number;
}

/** CRC-8/SAE-J1850: poly 0x1D, init 0xFF, xorout 0xFF. */
export const CRC8_SAE_J1850: Crc8Parameters = { poly: 0x1d, init: 0xff, xorout: 0xff };
/** CRC-8/AUTOSAR ("8H2F"): poly 0x2F, init 0xFF, xorout 0xFF. */
export const CRC8_AUTOSAR: Crc8Parameters = { poly: 0x2f, init: 0xff, xorout: 0xff };

const tables = new Map<number, Uint8Array>();

/** table[i] = register after shifting byte i through a zero register; one step is reg = table[reg ^ byte]. */
export function crc8Table(poly: number): Uint8Array {
	let table = tables.get(poly);
	if (table) return table;
	table = new Uint8Array(256);
	for (let i = 0; i < 256; i++) {
		let reg = i;
		for (let k = 0; k < 8; k++) reg = reg & 0x80 ? ((reg << 1) ^ poly) & 0xff : (reg << 1) & 0xff;
		table[i] = reg;
	}
	tables.set(poly, table);
	return table;
}

/** CRC register after `bytes[from … to)` starting from `register` (no final XOR). */
export function crc8Register(
	table: Uint8Array,
	register: number,
	bytes: Uint8Array,
	from = 0,
	to = bytes.length
): number {
	let reg = register;
	for (let i = from; i < to; i++) reg = table[reg ^ bytes[i]];
	return reg;
}

export function crc8(bytes: Uint8Array, parameters: Crc8Parameters): number {
	return crc8Register(crc8Table(parameters.poly), parameters.init, bytes) ^ parameters.xorout;
}
