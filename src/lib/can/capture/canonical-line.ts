/**
 * Fast path of the import for lines in the strict canonical shape (docs/capture-csv.md):
 * `0.012300,1a0,0,8,11 22 33 44 55 66 77 88`, possibly followed by more comma-separated columns.
 * It reads the characters of the chunk in place, so the row costs no field strings. It accepts only
 * lines the general route (papaparse + the row parser) would read without a problem, with the same
 * values; anything else — quotes, blanks, 0x prefixes, mismatches, bad values — returns false and
 * goes the general route, which also words the reason for a bad row.
 */
import { MAX_EXTENDED_ID, MAX_STANDARD_ID } from '../map';
import type { CaptureLayout } from './layout';
import { dlcMatches, isPayloadLength, parsePlainDecimal, type ParsedRow } from './row-parser';

const COMMA = 44;
const SPACE = 32;

/** 0–15 for a hex digit's char code, -1 otherwise (charCode above 127 included). */
function hexAt(text: string, i: number): number {
	const c = text.charCodeAt(i);
	if (c >= 48 && c <= 57) return c - 48;
	const lower = c | 32;
	return lower >= 97 && lower <= 102 ? lower - 87 : -1;
}

/** Layouts whose rows this fast path may read: the canonical columns, comma-separated, hex IDs. */
export function fitsCanonicalLine(layout: CaptureLayout): boolean {
	return (
		layout.delimiter === ',' &&
		layout.timeColumn === 0 &&
		layout.idColumn === 1 &&
		layout.idFormat === 'hex' &&
		layout.extendedColumn === 2 &&
		layout.dlcColumn === 3 &&
		layout.dataColumn === 4 &&
		layout.timeFormat === 'number' &&
		layout.busColumn === null &&
		layout.directionColumn === null &&
		layout.kindColumn === null &&
		layout.tagColumn === null
	);
}

/** Reads text[start, end) into `out`; true only when the general route would accept it identically. */
export function readCanonicalLine(
	text: string,
	start: number,
	end: number,
	out: ParsedRow,
	dlcMeaning: CaptureLayout['dlcMeaning']
): boolean {
	// time: digits with at most one point, same arithmetic as the general parseTime
	let i = text.indexOf(',', start);
	if (i < 0 || i >= end) return false;
	const time = parsePlainDecimal(text, start, i);
	if (time !== time) return false;

	// id: 1–8 hex digits
	let id = 0;
	const idStart = ++i;
	for (; i < end && text.charCodeAt(i) !== COMMA; i++) {
		const d = hexAt(text, i);
		if (d < 0) return false;
		id = id * 16 + d;
	}
	if (i === idStart || i - idStart > 8 || i >= end || id > MAX_EXTENDED_ID) return false;

	// extended: a bare 0 or 1
	const flag = text.charCodeAt(i + 1) - 48;
	if ((flag !== 0 && flag !== 1) || text.charCodeAt(i + 2) !== COMMA || i + 2 >= end) return false;
	if (flag === 0 && id > MAX_STANDARD_ID) return false;
	i += 3;

	// dlc: one or two digits
	let dlc = 0;
	const dlcStart = i;
	for (; i < end && text.charCodeAt(i) !== COMMA; i++) {
		const c = text.charCodeAt(i);
		if (c < 48 || c > 57) return false;
		dlc = dlc * 10 + (c - 48);
	}
	if (i === dlcStart || i - dlcStart > 2 || dlc > 64 || i >= end) return false;
	i++;

	// data: hex digit pairs, optionally one space between pairs, up to the end or the next comma
	let length = 0;
	const data = out.data;
	while (i < end && text.charCodeAt(i) !== COMMA) {
		if (length > 0 && text.charCodeAt(i) === SPACE) i++;
		if (i + 1 >= end || length === 64) return false;
		const hi = hexAt(text, i);
		const lo = hexAt(text, i + 1);
		if (hi < 0 || lo < 0) return false;
		data[length++] = hi * 16 + lo;
		i += 2;
	}
	if (!isPayloadLength(length) || !dlcMatches(dlc, length, dlcMeaning)) return false;

	out.time = time;
	out.id = id;
	out.extended = flag === 1;
	out.length = length;
	return true;
}
