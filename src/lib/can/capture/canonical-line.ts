/**
 * Fast path of the import for plain lines: it reads the characters of the chunk in place, so a row
 * costs no field strings (papaparse's splitting is most of the general route's work). It serves every
 * layout whose columns are a time (a number, a time of day or an ISO 8601 date-time), a hex ID (bare,
 * `0x` prefix or `h` suffix), optionally a bare 0/1 extended flag, a DLC, a direction (Rx/Tx) and a
 * bus already met, and one data column of hex pairs — the canonical layout (docs/capture-csv.md) and
 * e.g. `0.0123;3BAh;8;11 22 33` — in any column order and with any delimiter; columns with no role
 * are skipped. Instead of the data column it also reads byte columns side by side after every other
 * column (one byte each, as many as the DLC asks for, so rows may vary in width), with a tag after
 * the bytes or in a later column, when the tag is one already met. It accepts only lines the general route
 * (papaparse + the row parser) would read without a problem, with the same values; anything else —
 * quotes, blanks, marker letters, words, mismatches, bad values — returns false and goes the general
 * route, which also words the reason for a bad row.
 */
import { dlcToLength } from '../dlc';
import { MAX_EXTENDED_ID, MAX_STANDARD_ID } from '../map';
import type { CaptureLayout } from './layout';
import {
	clock,
	clockAt,
	dlcMatches,
	isPayloadLength,
	parseKind,
	parsePlainDecimal,
	plainDateTime,
	ROW_KIND,
	timeOfDayOnward,
	type ParsedRow,
	type RowParserState
} from './row-parser';

const SPACE = 32;
const ROLE = {
	none: 0,
	time: 1,
	id: 2,
	extended: 3,
	dlc: 4,
	data: 5,
	direction: 6,
	bus: 7
} as const;
/** Bus and tag names compared in place before a line goes the general route (which adds new ones). */
const NAMES_COMPARED = 16;

/** What the fast path needs of a layout: the role of each column up to the last one used. */
export interface LinePlan {
	delimiter: string;
	delimiterCode: number;
	roles: Uint8Array;
	dlcMeaning: CaptureLayout['dlcMeaning'];
	hasExtended: boolean;
	timeFormat: CaptureLayout['timeFormat'];
	/** Byte columns (0 with a data column); they start right after the last column in `roles`. */
	byteCount: number;
	/** Where the tag is: after the bytes read, a column index, or nowhere. */
	tagColumn: CaptureLayout['tagColumn'];
	/** The row parser's state, shared: bus names met, the time of day's days passed. */
	state: RowParserState;
}

/** 0–15 for a hex digit's char code, -1 otherwise (charCode above 127 included). */
function hexAt(text: string, i: number): number {
	const c = text.charCodeAt(i);
	if (c >= 48 && c <= 57) return c - 48;
	const lower = c | 32;
	return lower >= 97 && lower <= 102 ? lower - 87 : -1;
}

/**
 * The plan of a layout the fast path can read, or null (decimal IDs, a kind column, byte columns not
 * side by side or not after every other column, a tag beside a data column or among the bytes).
 */
export function linePlan(layout: CaptureLayout, state: RowParserState): LinePlan | null {
	const bytes = layout.byteColumns;
	const firstByte = bytes.length > 0 ? bytes[0] : -1;
	const { tagColumn } = layout;
	if (
		layout.idFormat !== 'hex' ||
		layout.kindColumn !== null ||
		bytes.some((column, k) => column !== firstByte + k) ||
		(tagColumn !== null &&
			(bytes.length === 0 || (tagColumn !== 'after-bytes' && tagColumn < firstByte + bytes.length)))
	)
		return null;
	const columns: [number | null, number][] = [
		[layout.timeColumn, ROLE.time],
		[layout.idColumn, ROLE.id],
		[layout.extendedColumn, ROLE.extended],
		[layout.dlcColumn, ROLE.dlc],
		[layout.dataColumn, ROLE.data],
		[layout.directionColumn, ROLE.direction],
		[layout.busColumn, ROLE.bus]
	];
	const last = Math.max(...columns.map(([c]) => c ?? 0));
	// Rows of byte columns vary in width, so every other column comes before the bytes.
	if (firstByte >= 0 && last >= firstByte) return null;
	const roles = new Uint8Array(firstByte >= 0 ? firstByte : last + 1);
	for (const [column, role] of columns) {
		if (column === null) continue;
		if (roles[column] !== ROLE.none) return null; // one column, two roles: the general route says so
		roles[column] = role;
	}
	return {
		delimiter: layout.delimiter,
		delimiterCode: layout.delimiter.charCodeAt(0),
		roles,
		dlcMeaning: layout.dlcMeaning,
		hasExtended: layout.extendedColumn !== null,
		timeFormat: layout.timeFormat,
		byteCount: bytes.length,
		tagColumn,
		state
	};
}

/** Reads text[start, end) into `out`; true only when the general route would accept it identically. */
export function readPlainLine(
	text: string,
	start: number,
	end: number,
	out: ParsedRow,
	plan: LinePlan
): boolean {
	const { roles, delimiter } = plan;
	const dc = plan.delimiterCode;
	let time = NaN;
	let id = -1;
	let flag = -1;
	let dlc = -1;
	let length = 0;
	let direction: 0 | 1 = 0;
	let bus = 0;
	let i = start;
	for (let column = 0; column < roles.length; column++) {
		if (i > end) return false; // the line has fewer columns
		// Fields read character by character find their own end (one pass over the text); the others
		// end at the next delimiter. Either way the field must end at a delimiter or the line's end.
		let k = i;
		switch (roles[column]) {
			case ROLE.id: {
				// 1–8 hex digits: bare, after 0x, or before an h suffix
				const prefixed = text.charCodeAt(k) === 48 && (text.charCodeAt(k + 1) | 32) === 120;
				if (prefixed) k += 2;
				const digits = k;
				id = 0;
				for (; k < end; k++) {
					const d = hexAt(text, k);
					if (d < 0) break;
					id = id * 16 + d;
				}
				if (k === digits || k - digits > 8 || id > MAX_EXTENDED_ID) return false;
				if (!prefixed && k < end && (text.charCodeAt(k) | 32) === 104) k++; // the h suffix
				break;
			}
			case ROLE.extended:
				flag = text.charCodeAt(k) - 48;
				if (k >= end || (flag !== 0 && flag !== 1)) return false;
				k++;
				break;
			case ROLE.dlc: {
				dlc = 0;
				for (; k < end; k++) {
					const c = text.charCodeAt(k);
					if (c < 48 || c > 57) break;
					dlc = dlc * 10 + (c - 48);
				}
				if (k === i || k - i > 2 || dlc > 64) return false;
				break;
			}
			case ROLE.data: {
				// hex digit pairs, optionally one space between pairs
				const data = out.data;
				while (k < end && text.charCodeAt(k) !== dc) {
					if (length > 0 && text.charCodeAt(k) === SPACE) k++;
					if (k + 1 >= end || length === 64) return false;
					const hi = hexAt(text, k);
					const lo = hexAt(text, k + 1);
					if (hi < 0 || lo < 0) return false;
					data[length++] = hi * 16 + lo;
					k += 2;
				}
				break;
			}
			case ROLE.direction: {
				// Rx or Tx in any case; anything else (words, blanks) goes the general route
				if (k + 2 > end || (text.charCodeAt(k + 1) | 32) !== 120) return false;
				const c = text.charCodeAt(k) | 32;
				if (c !== 114 && c !== 116) return false;
				direction = c === 116 ? 1 : 0;
				k += 2;
				break;
			}
			default: {
				k = text.indexOf(delimiter, i);
				if (k < 0 || k > end) k = end;
				const role = roles[column];
				if (role === ROLE.time) {
					// the same arithmetic as the general parseTimeAs on the shapes read here
					if (plan.timeFormat === 'number') time = parsePlainDecimal(text, i, k);
					else if (plan.timeFormat === 'date-time') time = plainDateTime(text, i, k);
					else if (clockAt(text, i, k, true)) time = clock.whole + clock.fraction;
					if (time !== time) return false;
				} else if (role === ROLE.bus) {
					// a name met before, as written (blanks go the general route, which trims them)
					const buses = plan.state.buses;
					bus = -1;
					for (let b = 0; b < buses.length && b < NAMES_COMPARED; b++) {
						if (buses[b].length === k - i && text.startsWith(buses[b], i)) {
							bus = b;
							break;
						}
					}
					if (bus < 0) return false;
				}
			}
		}
		if (k < end && text.charCodeAt(k) !== dc) return false;
		i = k + 1;
	}
	let tag = 0;
	if (plan.byteCount > 0) {
		// One byte per column (1 or 2 hex digits), as many as the DLC asks for, up to an empty column.
		const wanted = dlc < 0 ? plan.byteCount : dlc <= 15 && dlc > 8 ? dlcToLength(dlc) : dlc;
		const data = out.data;
		let column = roles.length; // the column at i (i > end: past the line's end)
		while (column - roles.length < plan.byteCount && length < wanted && i < end) {
			const hi = hexAt(text, i);
			if (hi < 0) {
				if (text.charCodeAt(i) === dc) break; // an empty column ends the bytes
				return false;
			}
			let k = i + 1;
			let value = hi;
			if (k < end && text.charCodeAt(k) !== dc) {
				const lo = hexAt(text, k++);
				if (lo < 0) return false;
				value = hi * 16 + lo;
			}
			if (k < end && text.charCodeAt(k) !== dc) return false;
			data[length++] = value;
			column++;
			i = k + 1;
		}
		if (plan.tagColumn !== null) {
			for (; plan.tagColumn !== 'after-bytes' && column < plan.tagColumn && i <= end; column++) {
				const k = text.indexOf(delimiter, i);
				i = k < 0 || k > end ? end + 1 : k + 1;
			}
			if (i < end) {
				let k = text.indexOf(delimiter, i);
				if (k < 0 || k > end) k = end;
				if (k > i) {
					// a tag met before, as written (blanks go the general route, which trims them)
					const tags = plan.state.tags;
					for (let t = 0; t < tags.length && t < NAMES_COMPARED; t++) {
						if (tags[t].length === k - i && text.startsWith(tags[t], i)) {
							tag = t + 1;
							break;
						}
					}
					// a tag saying "remote" makes an empty row a remote request: the general route
					if (tag === 0 || (length === 0 && parseKind(tags[tag - 1]) === ROW_KIND.remote))
						return false;
				}
			}
		}
	}
	if (!isPayloadLength(length) || (dlc >= 0 && !dlcMatches(dlc, length, plan.dlcMeaning)))
		return false;
	if (plan.hasExtended && flag === 0 && id > MAX_STANDARD_ID) return false;

	// Last, once the line is sure to be read here: the general route counts days for every row it reads.
	out.time = plan.timeFormat === 'time-of-day' ? timeOfDayOnward(plan.state, time) : time;
	out.id = id;
	out.extended = plan.hasExtended ? flag === 1 : id > MAX_STANDARD_ID;
	out.length = length;
	out.kind = ROW_KIND.data;
	out.bus = bus;
	out.direction = direction;
	out.tag = tag;
	return true;
}
