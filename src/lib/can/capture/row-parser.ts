/**
 * Turns the fields of one capture CSV row into a frame, following a CaptureLayout.
 * Hot path of the import: no regular expressions or allocations per row; the payload goes into a
 * reused buffer. A bad row yields a short human reason; the caller adds the line number.
 */
import { dlcToLength } from '../dlc';
import { MAX_EXTENDED_ID, MAX_STANDARD_ID, PAYLOAD_LENGTHS } from '../map';
import type { CaptureLayout } from './layout';

/** A data frame, a remote request (no payload) or an error frame (ISO 11898-1). */
export const ROW_KIND = { data: 0, remote: 1, error: 2 } as const;
export type RowKind = (typeof ROW_KIND)[keyof typeof ROW_KIND];

export interface ParsedRow {
	/** In the layout's time unit, as written (not yet made relative). */
	time: number;
	id: number;
	extended: boolean;
	length: number;
	/** 64-byte scratch buffer; bytes [0, length) are this row's payload. */
	data: Uint8Array;
	kind: RowKind;
	/** Index into the parser's bus names (0 when the layout has no bus column). */
	bus: number;
	/** 0 received, 1 transmitted by the logger. */
	direction: 0 | 1;
	/** Index into the parser's tag names + 1; 0 = no tag. */
	tag: number;
}

export const createParsedRow = (): ParsedRow => ({
	time: 0,
	id: 0,
	extended: false,
	length: 0,
	data: new Uint8Array(64),
	kind: ROW_KIND.data,
	bus: 0,
	direction: 0,
	tag: 0
});

/** Returns an error reason, or null when `out` holds the row. */
export type RowParser = (fields: string[], out: ParsedRow) => string | null;

/** Buses a capture may name: the frame store keeps a frame's bus in one byte. */
export const MAX_BUSES = 256;
/** Distinct tags a capture may carry: the frame store keeps a frame's tag in 16 bits. */
export const MAX_TAGS = 65535;

/**
 * What a row parser learns across rows: the bus and tag names met so far (a frame holds their
 * index) and how often a time of day passed midnight. One per file; the ingest reports it.
 */
export interface RowParserState {
	buses: string[];
	tags: string[];
	midnightCrossings: number;
	/** The last time of day read (-1 before the first) and the days passed since the first row, in s. */
	previousTimeOfDay: number;
	dayOffset: number;
}

export const createRowParserState = (): RowParserState => ({
	buses: [],
	tags: [],
	midnightCrossings: 0,
	previousTimeOfDay: -1,
	dayOffset: 0
});

const HALF_DAY = 43_200;

/**
 * A time of day (seconds since midnight) counted on from the recording's first day: a jump back of
 * more than half a day is the clock passing midnight, not a reordered row. Called once per row, in
 * file order, by both ingest routes.
 */
export function timeOfDayOnward(state: RowParserState, time: number): number {
	if (state.previousTimeOfDay >= 0 && time + HALF_DAY < state.previousTimeOfDay) {
		state.dayOffset += 86_400;
		state.midnightCrossings++;
	}
	state.previousTimeOfDay = time;
	return time + state.dayOffset;
}

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

const TIME_OF_DAY = /^(\d{1,2}):(\d{2}):(\d{2})(?:[.,](\d{1,9}))?$/;

/** The value of `n` decimal digits at s[at…], or -1 if any is not a digit. */
function digitsAt(s: string, at: number, n: number): number {
	let v = 0;
	for (let i = at; i < at + n; i++) {
		const c = s.charCodeAt(i) - 48;
		if (c < 0 || c > 9) return -1;
		v = v * 10 + c;
	}
	return v;
}

/** What clockAt read: whole seconds since midnight and the fraction (kept apart, summed as the slow route sums). */
export const clock = { whole: 0, fraction: 0 };

/**
 * The fast path of both clock notations, without a regular expression or strings: `h:mm:ss` or
 * `hh:mm:ss` (`shortHour`) with an optional fraction of 1–9 digits, exactly s[start, end), into
 * `clock`. The parts are the same numbers as the regular-expression route's (integers, and the
 * fraction's digits ÷ 10^digits); false means "not this plain shape" and the caller takes that route.
 */
export function clockAt(s: string, start: number, end: number, shortHour: boolean): boolean {
	const hourDigits = shortHour && s.charCodeAt(start + 1) === 58 ? 1 : 2;
	const at = start + hourDigits;
	if (end < at + 6 || s.charCodeAt(at) !== 58 || s.charCodeAt(at + 3) !== 58) return false;
	const h = digitsAt(s, start, hourDigits);
	const min = digitsAt(s, at + 1, 2);
	const sec = digitsAt(s, at + 4, 2);
	if (h < 0 || min < 0 || sec < 0 || h > 24 || min > 59 || sec > 60) return false;
	clock.whole = h * 3600 + min * 60 + sec;
	clock.fraction = 0;
	if (end === at + 6) return true;
	const point = s.charCodeAt(at + 6);
	const n = end - at - 7;
	if ((point !== 46 && point !== 44) || n < 1 || n > 9) return false;
	const digits = digitsAt(s, at + 7, n);
	if (digits < 0) return false;
	clock.fraction = digits / POWERS_OF_TEN[n];
	return true;
}

/** The day of the last date read (files repeat one date for many rows): its text key and seconds. */
let lastDayKey = -1;
let lastDaySeconds = 0;

/**
 * The fast path of ISO 8601 date-times: `YYYY-MM-DDThh:mm:ss[.f]` with T or a space, ending there or
 * in `Z` — as exact as the regular-expression route (Date.UTC of the day, once per day, plus the
 * clock); NaN for any other shape (an offset, blanks, a year before 1000), which that route reads.
 */
export function plainDateTime(s: string, start = 0, end = s.length): number {
	if (end - start < 19) return NaN;
	if ((s.charCodeAt(end - 1) | 32) === 122) end--; // Z
	const sep = s.charCodeAt(start + 10);
	if (
		s.charCodeAt(start + 4) !== 45 ||
		s.charCodeAt(start + 7) !== 45 ||
		(sep !== 84 && sep !== 32)
	)
		return NaN;
	const y = digitsAt(s, start, 4);
	const mo = digitsAt(s, start + 5, 2);
	const d = digitsAt(s, start + 8, 2);
	if (y < 1000 || mo < 1 || mo > 12 || d < 1 || d > 31) return NaN;
	if (!clockAt(s, start + 11, end, false)) return NaN;
	const key = y * 10_000 + mo * 100 + d;
	if (key !== lastDayKey) {
		const day = Date.UTC(y, mo - 1, d);
		// Date.UTC rolls 31 February over into March: dates that do not exist take the slow route (NaN).
		if (new Date(day).getUTCDate() !== d) return NaN;
		lastDayKey = key;
		lastDaySeconds = day / 1000;
	}
	return lastDaySeconds + clock.whole + clock.fraction;
}

/** `hh:mm:ss` with an optional fraction of up to 9 digits, in seconds since midnight; NaN otherwise. */
export function parseTimeOfDay(field: string): number {
	const s = trimField(field);
	if (clockAt(s, 0, s.length, true)) return clock.whole + clock.fraction;
	const m = TIME_OF_DAY.exec(s);
	if (!m) return NaN;
	const [h, min, sec] = [Number(m[1]), Number(m[2]), Number(m[3])];
	// 24:00:00 ends a day in ISO 8601; a leap second may read :60 (ISO 8601:2004, 4.2.1; clause number from memory).
	if (h > 24 || min > 59 || sec > 60) return NaN;
	return h * 3600 + min * 60 + sec + (m[4] ? Number(m[4]) / 10 ** m[4].length : 0);
}

const DATE_TIME =
	/^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2}):(\d{2})(?:[.,](\d{1,9}))?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

/**
 * ISO 8601 calendar date and time (`2026-03-14T09:26:53.589793Z`, a space instead of T allowed),
 * in seconds since 1970-01-01 UTC; without an offset the text is read as UTC. NaN otherwise.
 * The fraction is added to whole seconds so microseconds survive (Date keeps milliseconds only).
 */
export function parseDateTime(field: string): number {
	const fast = plainDateTime(field);
	if (fast === fast) return fast;
	const m = DATE_TIME.exec(trimField(field));
	if (!m) return NaN;
	const [y, mo, d, h, mi, se] = m.slice(1, 7).map(Number);
	if (mo < 1 || mo > 12 || d < 1 || d > 31 || h > 24 || mi > 59 || se > 60) return NaN;
	const whole = Date.UTC(y, mo - 1, d, h, mi, se) / 1000;
	// Date.UTC rolls 31 February over into March: refuse dates that do not exist.
	if (new Date(Date.UTC(y, mo - 1, d)).getUTCDate() !== d) return NaN;
	let offset = 0;
	const zone = m[8];
	if (zone && zone.toUpperCase() !== 'Z') {
		const digits = zone.slice(1).replace(':', '');
		offset =
			(Number(digits.slice(0, 2)) * 3600 + Number(digits.slice(2) || 0) * 60) *
			(zone[0] === '-' ? -1 : 1);
	}
	return whole - offset + (m[7] ? Number(m[7]) / 10 ** m[7].length : 0);
}

/** The time field in the layout's notation: a number in its unit, or seconds for the text forms. */
export function parseTimeAs(field: string, format: CaptureLayout['timeFormat']): number {
	if (format === 'number') return parseTime(field);
	return format === 'time-of-day' ? parseTimeOfDay(field) : parseDateTime(field);
}

/** Which notation a time field is written in, or null when it is none of them. */
export function timeFormatOf(field: string): CaptureLayout['timeFormat'] | null {
	if (Number.isFinite(parseTime(field))) return 'number';
	if (Number.isFinite(parseTimeOfDay(field))) return 'time-of-day';
	if (Number.isFinite(parseDateTime(field))) return 'date-time';
	return null;
}

/** An ID field read by parseIdInto: its value and whether it carries the extended marker letter. */
export interface ParsedId {
	id: number;
	marked: boolean;
}

/**
 * An ID in any of the notations captures use: hex with a `0x` prefix, an `h`/`H` suffix or neither;
 * or decimal. Either may end with the letter `x`/`X` marking a 29-bit (extended) ID — never a hex
 * digit, so it cannot be misread. Up to 8 hex / 10 decimal digits. false when malformed.
 */
export function parseIdInto(field: string, format: 'hex' | 'decimal', out: ParsedId): boolean {
	const s = trimField(field);
	let end = s.length;
	// "0x" alone is a bare prefix, not the digit 0 with a marker.
	out.marked =
		end > 1 && (s.charCodeAt(end - 1) | 32) === 120 && !(end === 2 && s.charCodeAt(0) === 48);
	if (out.marked) end--;
	let value = 0;
	if (format === 'decimal') {
		if (end === 0 || end > 10) return false;
		for (let i = 0; i < end; i++) {
			const c = s.charCodeAt(i);
			if (c < 48 || c > 57) return false;
			value = value * 10 + (c - 48);
		}
		out.id = value;
		return true;
	}
	let i = 0;
	if (end > 2 && s.charCodeAt(0) === 48 && (s.charCodeAt(1) | 32) === 120) i = 2;
	else if (end > 1 && (s.charCodeAt(end - 1) | 32) === 104) end--; // the h suffix
	if (end === i || end - i > 8) return false;
	for (; i < end; i++) {
		const d = hexDigit(s.charCodeAt(i));
		if (d < 0) return false;
		value = value * 16 + d;
	}
	out.id = value;
	return true;
}

const scratchId: ParsedId = { id: 0, marked: false };

/** The ID's value in any notation parseIdInto reads (the extended marker dropped); -1 when malformed. */
export function parseId(field: string, format: 'hex' | 'decimal'): number {
	return parseIdInto(field, format, scratchId) ? scratchId.id : -1;
}

/** How an ID field is written, in words for the confirmation screen; null when it is no ID. */
export function idNotationOf(field: string): string | null {
	const s = trimField(field);
	const marker = /[xX]$/.test(s) && !/^0[xX]$/.test(s) ? ', extended marked by a trailing x' : '';
	const bare = marker ? s.slice(0, -1) : s;
	if (/^0[xX][0-9a-fA-F]{1,8}$/.test(bare)) return `hex with a 0x prefix${marker}`;
	if (/^[0-9a-fA-F]{1,8}[hH]$/.test(bare)) return `hex with an h suffix${marker}`;
	if (/^\d{1,8}$/.test(bare)) return `digits only (hex or decimal)${marker}`;
	if (/^[0-9a-fA-F]{1,8}$/.test(bare)) return `hex without prefix or suffix${marker}`;
	return null;
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

const REMOTE_WORDS = new Set(['r', 'rtr', 'remote', 'rem', 'remoteframe', 'request']);
const ERROR_WORDS = new Set(['err', 'error', 'errorframe', 'errframe', 'error frame']);
const DATA_WORDS = new Set(['', 'd', 'data', 'dat', 'dataframe', 'fd', 'brs', 'normal']);

/** A frame-kind marker: data, remote or error; undefined when unreadable. */
export function parseKind(field: string): RowKind | undefined {
	const s = trimField(field).toLowerCase();
	if (DATA_WORDS.has(s)) return ROW_KIND.data;
	if (REMOTE_WORDS.has(s)) return ROW_KIND.remote;
	if (ERROR_WORDS.has(s)) return ROW_KIND.error;
	return undefined;
}

/**
 * An ID field some loggers fill with a word for an error frame ("ErrorFrame", "error"). Asked of
 * every row: every such word starts with "e", so any other ID is answered without a new string.
 */
function isErrorWord(field: string): boolean {
	const s = trimField(field);
	return (s.charCodeAt(0) | 32) === 101 && ERROR_WORDS.has(s.toLowerCase());
}

const RX_WORDS = new Set(['', 'rx', 'r', 'receive', 'received', 'in', 'input']);
const TX_WORDS = new Set(['tx', 't', 'transmit', 'transmitted', 'sent', 'send', 'out', 'output']);

/** 0 received, 1 transmitted; undefined when unreadable. */
export function parseDirection(field: string): 0 | 1 | undefined {
	// Rx and Tx in any case, without a new string (asked of every row).
	if (field.length === 2 && (field.charCodeAt(1) | 32) === 120) {
		const c = field.charCodeAt(0) | 32;
		if (c === 114) return 0;
		if (c === 116) return 1;
	}
	const s = trimField(field).toLowerCase();
	if (RX_WORDS.has(s)) return 0;
	if (TX_WORDS.has(s)) return 1;
	return undefined;
}

/** Index of `name` in `names`, adding it when new and there is room; -1 when full. */
function intern(names: string[], index: Map<string, number>, name: string, max: number): number {
	const known = index.get(name);
	if (known !== undefined) return known;
	if (names.length >= max) return -1;
	index.set(name, names.length);
	names.push(name);
	return names.length - 1;
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

export function createRowParser(
	layout: CaptureLayout,
	state: RowParserState = createRowParserState()
): RowParser {
	const { timeColumn, idColumn, extendedColumn, dlcColumn, dataColumn, byteColumns } = layout;
	const { busColumn, directionColumn, kindColumn, tagColumn, timeFormat } = layout;
	const needed = Math.max(
		timeColumn,
		idColumn,
		extendedColumn ?? 0,
		dlcColumn ?? 0,
		dataColumn ?? 0,
		busColumn ?? 0,
		directionColumn ?? 0
	);
	const busIndex = new Map(state.buses.map((name, i) => [name, i]));
	const tagIndex = new Map(state.tags.map((name, i) => [name, i]));
	const id: ParsedId = { id: 0, marked: false };

	return (fields, out) => {
		if (fields.length <= needed) {
			return `expected at least ${needed + 1} columns, found ${fields.length}`;
		}
		let time = parseTimeAs(fields[timeColumn], timeFormat);
		if (!Number.isFinite(time)) {
			const wanted = {
				number: 'a number',
				'time-of-day': 'a time of day hh:mm:ss',
				'date-time': 'an ISO 8601 date-time'
			};
			return `time "${fields[timeColumn].trim()}" is not ${wanted[timeFormat]}`;
		}
		if (timeFormat === 'time-of-day') time = timeOfDayOnward(state, time);

		let kind: RowKind = ROW_KIND.data;
		if (kindColumn !== null) {
			const k = kindColumn < fields.length ? parseKind(fields[kindColumn]) : ROW_KIND.data;
			if (k === undefined) {
				return `frame kind "${fields[kindColumn].trim()}" is not data, remote (RTR) or error`;
			}
			kind = k;
		}
		if (kind === ROW_KIND.data && isErrorWord(fields[idColumn])) kind = ROW_KIND.error;

		let bus = 0;
		if (busColumn !== null) {
			const name = trimField(fields[busColumn]);
			bus = intern(state.buses, busIndex, name, MAX_BUSES);
			if (bus < 0) {
				return `bus "${name}" would be bus number ${MAX_BUSES + 1}; a capture holds at most ${MAX_BUSES} buses (is the bus column right?)`;
			}
		}
		let direction: 0 | 1 = 0;
		if (directionColumn !== null) {
			const d = parseDirection(fields[directionColumn]);
			if (d === undefined) {
				return `direction "${fields[directionColumn].trim()}" is not Rx or Tx`;
			}
			direction = d;
		}

		if (kind === ROW_KIND.error) {
			// An error frame has no ID or payload worth reading (ISO 11898-1, error frame; from memory).
			out.time = time;
			out.id = 0;
			out.extended = false;
			out.length = 0;
			out.kind = kind;
			out.bus = bus;
			out.direction = direction;
			out.tag = 0;
			return null;
		}

		if (!parseIdInto(fields[idColumn], layout.idFormat, id)) {
			return `ID "${fields[idColumn].trim()}" is not a ${layout.idFormat === 'hex' ? 'hex' : 'decimal'} number`;
		}
		if (id.id > MAX_EXTENDED_ID)
			return `ID 0x${id.id.toString(16).toUpperCase()} is above 0x1FFFFFFF`;

		let extended: boolean | null | undefined = id.marked ? true : null;
		if (extendedColumn !== null && !id.marked) {
			extended = parseFlag(fields[extendedColumn]);
			if (extended === undefined) {
				return `extended flag "${fields[extendedColumn].trim()}" is not 0/1 or true/false`;
			}
		}
		if (extended === null) extended = id.id > MAX_STANDARD_ID;
		else if (!extended && id.id > MAX_STANDARD_ID) {
			return `ID 0x${id.id.toString(16).toUpperCase()} does not fit 11 bits but the row marks it standard`;
		}

		let dlc = -1;
		if (dlcColumn !== null) {
			dlc = parseSmallInt(fields[dlcColumn]);
			if (dlc < 0) return `DLC "${fields[dlcColumn].trim()}" is not a whole number from 0 to 64`;
		}

		let length = 0;
		let afterBytes = byteColumns.length > 0 ? byteColumns[0] : -1;
		if (kind === ROW_KIND.remote) {
			// A remote request carries no data; its DLC is the length asked for.
		} else if (dataColumn !== null) {
			const parsed = parseHexBytes(fields[dataColumn], out.data);
			if (typeof parsed === 'string') return parsed;
			length = parsed;
		} else {
			// Separate byte columns: with a DLC it decides how many to read, else read up to the first empty one.
			const wanted = dlc < 0 ? byteColumns.length : dlc <= 15 && dlc > 8 ? dlcToLength(dlc) : dlc;
			for (let k = 0; k < byteColumns.length && length < wanted; k++) {
				const field = byteColumns[k] < fields.length ? trimField(fields[byteColumns[k]]) : '';
				if (field.length === 0) break;
				const a = hexDigit(field.charCodeAt(0));
				const b = field.length === 2 ? hexDigit(field.charCodeAt(1)) : 0;
				if (field.length > 2 || a < 0 || b < 0)
					return `data byte ${k} "${field}" is not a hex byte`;
				out.data[length++] = field.length === 2 ? a * 16 + b : a;
				afterBytes = byteColumns[k] + 1;
			}
		}
		if (!isPayloadLength(length)) {
			return `${length} data bytes is not a CAN payload length (0–8, 12, 16, 20, 24, 32, 48 or 64)`;
		}
		if (kind === ROW_KIND.data && dlc >= 0 && !dlcMatches(dlc, length, layout.dlcMeaning)) {
			return `DLC ${dlc} does not match the ${length} data bytes given`;
		}

		let tag = 0;
		const tagAt = tagColumn === 'after-bytes' ? afterBytes : tagColumn;
		if (tagAt !== null && tagAt >= 0 && tagAt < fields.length) {
			const text = trimField(fields[tagAt]);
			if (text.length > 0) {
				const k = parseKind(text);
				if (k === ROW_KIND.remote && kindColumn === null && length === 0) kind = k;
				const index = intern(state.tags, tagIndex, text, MAX_TAGS);
				if (index < 0)
					return `tag "${text}" is one more than the ${MAX_TAGS} different tags a capture keeps`;
				tag = index + 1;
			}
		}

		out.time = time;
		out.id = id.id;
		out.extended = extended;
		out.length = length;
		out.kind = kind;
		out.bus = bus;
		out.direction = direction;
		out.tag = tag;
		return null;
	};
}
