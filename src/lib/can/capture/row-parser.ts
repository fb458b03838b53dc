/**
 * Turns the fields of one capture CSV row into a frame, following a CaptureLayout.
 * Hot path of the import: no regular expressions or allocations per row; the payload goes into a
 * reused buffer. A bad row yields a short human reason; the caller adds the line number.
 */
import { dlcToLength } from '../dlc';
import { MAX_EXTENDED_ID, MAX_STANDARD_ID, PAYLOAD_LENGTHS } from '../map';
import type { CaptureLayout } from './layout';

export interface ParsedRow {
	/** In the layout's time unit, as written (not yet made relative). */
	time: number;
	id: number;
	extended: boolean;
	length: number;
	/** 64-byte scratch buffer; bytes [0, length) are this row's payload. */
	data: Uint8Array;
}

export const createParsedRow = (): ParsedRow => ({
	time: 0,
	id: 0,
	extended: false,
	length: 0,
	data: new Uint8Array(64)
});

/** Returns an error reason, or null when `out` holds the row. */
export type RowParser = (fields: string[], out: ParsedRow) => string | null;

/** 0–15 for each hex digit's char code, -1 for every other code below 128: one load, no branches. */
const HEX_VALUE = (() => {
	const table = new Int8Array(128).fill(-1);
	for (let d = 0; d < 10; d++) table[48 + d] = d;
	for (let d = 0; d < 6; d++) table[65 + d] = table[97 + d] = 10 + d;
	return table;
})();

/** 0–15 for a hex digit's char code, -1 otherwise. */
const hexDigit = (c: number): number => (c < 128 ? HEX_VALUE[c] : -1);

const isBlank = (c: number) => c === 32 || c === 9;

/** Trims spaces and tabs (and a stray CR) without allocating when there are none. */
function trimField(s: string): string {
	const last = s.length - 1;
	if (last < 0) return s;
	const c0 = s.charCodeAt(0);
	const cn = s.charCodeAt(last);
	return isBlank(c0) || isBlank(cn) || cn === 13 || c0 === 34 ? s.trim().replace(/^"|"$/g, '') : s;
}

/** Exact powers of ten up to 10^22, the largest that a double holds exactly. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * Plain "123.456" (decimal point or comma, at most 15 digits) without building a string: the digits
 * form an integer below 2^53 and 10^k is exact, so one division gives the correctly rounded double —
 * the same result as Number() (Clinger 1990, "How to Read Floating Point Numbers Accurately", fast path).
 * NaN means "not that simple shape"; the caller then takes the general route. Reads s[start, end).
 */
export function parsePlainDecimal(s: string, start = 0, end = s.length): number {
	let mantissa = 0;
	let digits = 0;
	let point = -1;
	for (let i = start; i < end; i++) {
		const c = s.charCodeAt(i);
		if (c >= 48 && c <= 57) {
			mantissa = mantissa * 10 + (c - 48);
			digits++;
		} else if ((c === 46 || c === 44) && point < 0) point = digits;
		else return NaN;
	}
	if (digits === 0 || digits > 15) return NaN;
	return point < 0 ? mantissa : mantissa / POWERS_OF_TEN[digits - point];
}

export function parseTime(field: string): number {
	const plain = parsePlainDecimal(field);
	if (plain === plain) return plain;
	let s = trimField(field);
	// Decimal comma, as written where ';' is the delimiter.
	if (s.indexOf(',') >= 0) s = s.replace(',', '.');
	return s.length === 0 ? NaN : Number(s);
}

/** Hex ID with or without 0x, or decimal; -1 when malformed. Up to 8 hex / 10 decimal digits. */
export function parseId(field: string, format: 'hex' | 'decimal'): number {
	const s = trimField(field);
	let value = 0;
	if (format === 'decimal') {
		if (s.length === 0 || s.length > 10) return -1;
		for (let i = 0; i < s.length; i++) {
			const c = s.charCodeAt(i);
			if (c < 48 || c > 57) return -1;
			value = value * 10 + (c - 48);
		}
		return value;
	}
	let i = 0;
	if (s.length > 2 && s.charCodeAt(0) === 48 && (s.charCodeAt(1) | 32) === 120) i = 2;
	if (s.length === i || s.length - i > 8) return -1;
	for (; i < s.length; i++) {
		const d = hexDigit(s.charCodeAt(i));
		if (d < 0) return -1;
		value = value * 16 + d;
	}
	return value;
}

const TRUE_FLAGS = new Set(['1', 'true', 't', 'yes', 'y', 'x', 'e', 'ext', 'extended', 'eff']);
const FALSE_FLAGS = new Set(['0', 'false', 'f', 'no', 'n', 's', 'std', 'standard', 'sff']);

/** true / false, null when the field is empty (then inferred from the ID), undefined when unreadable. */
export function parseFlag(field: string): boolean | null | undefined {
	// The canonical layout writes a bare 0 or 1: answer without trimming or lower-casing.
	if (field.length === 1) {
		const c = field.charCodeAt(0);
		if (c === 48) return false;
		if (c === 49) return true;
	}
	const s = trimField(field).toLowerCase();
	if (s.length === 0) return null;
	if (TRUE_FLAGS.has(s)) return true;
	if (FALSE_FLAGS.has(s)) return false;
	return undefined;
}

/** Whole number 0–64, -1 when malformed. */
export function parseSmallInt(field: string): number {
	const s = trimField(field);
	if (s.length === 0 || s.length > 2) return -1;
	let value = 0;
	for (let i = 0; i < s.length; i++) {
		const c = s.charCodeAt(i);
		if (c < 48 || c > 57) return -1;
		value = value * 10 + (c - 48);
	}
	return value <= 64 ? value : -1;
}

/**
 * Hex payload "11 22 33" or "112233" into `out`; returns the byte count or an error reason.
 * Spaced bytes may be one digit ("1 2 3"); unspaced text must have an even number of digits.
 */
export function parseHexBytes(field: string, out: Uint8Array): number | string {
	let n = 0;
	let pending = -1; // first digit of a byte not yet complete
	let digitsInToken = 0;
	// Written without a helper closure: this runs once per row of a million-row import.
	// A token ends at a blank or at the end; a leftover digit is a byte only if the token had one digit.
	for (let i = 0; i <= field.length; i++) {
		const c = i < field.length ? field.charCodeAt(i) : 32;
		if (isBlank(c) || c === 13 || c === 34) {
			if (pending >= 0) {
				if (digitsInToken !== 1) return `"${field.trim()}" has an odd number of hex digits`;
				if (n === 64) return 'more than 64 data bytes';
				out[n++] = pending;
				pending = -1;
			}
			digitsInToken = 0;
			continue;
		}
		const d = hexDigit(c);
		if (d < 0) return `"${field.trim()}" is not hex bytes`;
		digitsInToken++;
		if (pending < 0) {
			pending = d;
		} else {
			if (n === 64) return 'more than 64 data bytes';
			out[n++] = pending * 16 + d;
			pending = -1;
		}
	}
	return n;
}

const FD_LENGTHS = new Set<number>(PAYLOAD_LENGTHS);

/** A payload length a classical or CAN FD frame can have (ISO 11898-1). */
export const isPayloadLength = (length: number): boolean => FD_LENGTHS.has(length);

/** Checks the DLC column against the payload actually given (docs/capture-csv.md: the data column decides). */
export function dlcMatches(
	dlc: number,
	length: number,
	meaning: CaptureLayout['dlcMeaning']
): boolean {
	const asCode = dlc <= 15 && dlcToLength(dlc) === length;
	if (meaning === 'code') return asCode;
	if (meaning === 'bytes') return dlc === length;
	return asCode || dlc === length;
}

export function createRowParser(layout: CaptureLayout): RowParser {
	const { timeColumn, idColumn, extendedColumn, dlcColumn, dataColumn, byteColumns } = layout;
	const needed = Math.max(
		timeColumn,
		idColumn,
		extendedColumn ?? 0,
		dlcColumn ?? 0,
		dataColumn ?? 0
	);

	return (fields, out) => {
		if (fields.length <= needed) {
			return `expected at least ${needed + 1} columns, found ${fields.length}`;
		}
		const time = parseTime(fields[timeColumn]);
		if (!Number.isFinite(time)) return `time "${fields[timeColumn].trim()}" is not a number`;

		const id = parseId(fields[idColumn], layout.idFormat);
		if (id < 0) {
			return `ID "${fields[idColumn].trim()}" is not a ${layout.idFormat === 'hex' ? 'hex' : 'decimal'} number`;
		}
		if (id > MAX_EXTENDED_ID) return `ID 0x${id.toString(16).toUpperCase()} is above 0x1FFFFFFF`;

		let extended: boolean | null | undefined = null;
		if (extendedColumn !== null) {
			extended = parseFlag(fields[extendedColumn]);
			if (extended === undefined) {
				return `extended flag "${fields[extendedColumn].trim()}" is not 0/1 or true/false`;
			}
		}
		if (extended === null) extended = id > MAX_STANDARD_ID;
		else if (!extended && id > MAX_STANDARD_ID) {
			return `ID 0x${id.toString(16).toUpperCase()} does not fit 11 bits but the row marks it standard`;
		}

		let dlc = -1;
		if (dlcColumn !== null) {
			dlc = parseSmallInt(fields[dlcColumn]);
			if (dlc < 0) return `DLC "${fields[dlcColumn].trim()}" is not a whole number from 0 to 64`;
		}

		let length: number;
		if (dataColumn !== null) {
			const parsed = parseHexBytes(fields[dataColumn], out.data);
			if (typeof parsed === 'string') return parsed;
			length = parsed;
		} else {
			// Separate byte columns: with a DLC it decides how many to read, else read up to the first empty one.
			const wanted = dlc < 0 ? byteColumns.length : dlc <= 15 && dlc > 8 ? dlcToLength(dlc) : dlc;
			length = 0;
			for (let k = 0; k < byteColumns.length && length < wanted; k++) {
				const field = byteColumns[k] < fields.length ? trimField(fields[byteColumns[k]]) : '';
				if (field.length === 0) break;
				const a = hexDigit(field.charCodeAt(0));
				const b = field.length === 2 ? hexDigit(field.charCodeAt(1)) : 0;
				if (field.length > 2 || a < 0 || b < 0)
					return `data byte ${k} "${field}" is not a hex byte`;
				out.data[length++] = field.length === 2 ? a * 16 + b : a;
			}
		}
		if (!isPayloadLength(length)) {
			return `${length} data bytes is not a CAN payload length (0–8, 12, 16, 20, 24, 32, 48 or 64)`;
		}
		if (dlc >= 0 && !dlcMatches(dlc, length, layout.dlcMeaning)) {
			return `DLC ${dlc} does not match the ${length} data bytes given`;
		}
		out.time = time;
		out.id = id;
		out.extended = extended;
		out.length = length;
		return null;
	};
}
