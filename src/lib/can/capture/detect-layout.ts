/**
 * Guesses a capture CSV's layout from its first rows, and explains the guess in plain sentences
 * so the user can confirm or correct it before the whole file is read.
 * Order of evidence: header names first, then which candidate layout reads the most sample rows.
 */
import Papa from 'papaparse';
import {
	CAPTURE_DELIMITERS,
	captureLayoutSchema,
	type CaptureLayout,
	type TimeUnit
} from './layout';
import { createParsedRow, createRowParser, parseTime } from './row-parser';

/** A problem with the capture as a whole (not one row): empty, unreadable columns, … */
export class CaptureFormatError extends Error {
	override name = 'CaptureFormatError';
}

export interface LayoutGuess {
	layout: CaptureLayout;
	/** One sentence per decision, for the confirmation screen and the CLI's stderr. */
	notes: string[];
}

/** Rows of the sample the guess looks at. */
export const SAMPLE_ROWS = 200;

const normalise = (name: string) => name.toLowerCase().replace(/[^a-z0-9µ]/g, '');

const TIME_NAME = /^(timestamp|time|ts|t)(.*)$/;
const ID_NAMES = new Set([
	'id',
	'canid',
	'identifier',
	'arbid',
	'arbitrationid',
	'msgid',
	'messageid',
	'frameid',
	'idhex',
	'iddec',
	'iddecimal'
]);
const EXTENDED_NAMES = new Set([
	'extended',
	'ext',
	'ide',
	'isextended',
	'xtd',
	'eff',
	'extid',
	'extendedid'
]);
const DLC_NAMES = new Set(['dlc', 'len', 'length', 'size', 'datalength', 'bytecount', 'numbytes']);
const DATA_NAMES = new Set([
	'data',
	'payload',
	'hex',
	'datahex',
	'databytes',
	'bytes',
	'payloadhex'
]);
const BYTE_COLUMN = /^(d|b|byte|data|db|databyte)(\d{1,2})$/;

function unitFromSuffix(suffix: string): TimeUnit | null {
	if (/^(us|µs|usec|micro)/.test(suffix)) return 'us';
	if (/^(ms|msec|milli)/.test(suffix)) return 'ms';
	if (/^(s|sec|secs|seconds)$/.test(suffix)) return 's';
	return null;
}

interface HeaderMapping {
	time: number | null;
	timeUnit: TimeUnit | null;
	id: number | null;
	idDecimal: boolean;
	extended: number | null;
	dlc: number | null;
	data: number | null;
	bytes: number[];
}

function mapHeader(header: string[]): HeaderMapping {
	const m: HeaderMapping = {
		time: null,
		timeUnit: null,
		id: null,
		idDecimal: false,
		extended: null,
		dlc: null,
		data: null,
		bytes: []
	};
	const numbered: [number, number][] = [];
	header.forEach((raw, column) => {
		const name = normalise(raw);
		const time = TIME_NAME.exec(name);
		if (m.time === null && time && (time[2] === '' || unitFromSuffix(time[2]))) {
			m.time = column;
			m.timeUnit = unitFromSuffix(time[2]);
		} else if (m.id === null && ID_NAMES.has(name)) {
			m.id = column;
			m.idDecimal = name.includes('dec');
		} else if (m.extended === null && EXTENDED_NAMES.has(name)) m.extended = column;
		else if (m.dlc === null && DLC_NAMES.has(name)) m.dlc = column;
		else if (m.data === null && DATA_NAMES.has(name)) m.data = column;
		else {
			const byte = BYTE_COLUMN.exec(name);
			if (byte) numbered.push([Number(byte[2]), column]);
		}
	});
	m.bytes = numbered.sort((a, b) => a[0] - b[0]).map(([, column]) => column);
	return m;
}

type Columns = Pick<
	CaptureLayout,
	'timeColumn' | 'idColumn' | 'extendedColumn' | 'dlcColumn' | 'dataColumn' | 'byteColumns'
>;

/** Column arrangements to try when the header does not say, most usual first. */
function positionalCandidates(columnCount: number): Columns[] {
	const out: Columns[] = [];
	for (const extendedColumn of [2, null]) {
		const afterFlag = extendedColumn === null ? 2 : 3;
		for (const dlcColumn of [afterFlag, null]) {
			const dataStart = dlcColumn === null ? afterFlag : afterFlag + 1;
			if (dataStart >= columnCount) continue;
			const base = { timeColumn: 0, idColumn: 1, extendedColumn, dlcColumn };
			out.push({ ...base, dataColumn: dataStart, byteColumns: [] });
			const byteColumns = Array.from(
				{ length: Math.min(64, columnCount - dataStart) },
				(_, k) => dataStart + k
			);
			if (byteColumns.length > 1) out.push({ ...base, dataColumn: null, byteColumns });
		}
	}
	return out;
}

function guessTimeUnit(
	texts: string[],
	hinted: TimeUnit | null
): { unit: TimeUnit; epoch: boolean; why: string } {
	const values = texts.map(parseTime).filter(Number.isFinite);
	if (hinted && values.length === 0) return { unit: hinted, epoch: false, why: 'the column name' };
	if (values.length === 0)
		return { unit: 's', epoch: false, why: 'the canonical layout (no rows to judge by)' };
	const first = values[0];
	if (hinted) {
		const seconds = first * { s: 1, ms: 1e-3, us: 1e-6 }[hinted];
		// Over about three years since the start can only be a wall-clock time.
		return { unit: hinted, epoch: seconds > 1e8, why: 'the column name' };
	}
	// Unix epoch times of years 2001–2286 in s, ms or µs have these magnitudes.
	if (first >= 1e9 && first < 1e10)
		return { unit: 's', epoch: true, why: 'the size of the values' };
	if (first >= 1e12 && first < 1e13)
		return { unit: 'ms', epoch: true, why: 'the size of the values' };
	if (first >= 1e15 && first < 1e16)
		return { unit: 'us', epoch: true, why: 'the size of the values' };
	if (texts.some((t) => /[.,]\d/.test(t)))
		return { unit: 's', epoch: false, why: 'the decimal fractions' };
	// Whole numbers: frames at least ~44 µs apart even at 1 Mbit/s (ISO 11898-1 minimum frame of
	// 44 bits), so a typical gap of 40 or more is microseconds; a few units is milliseconds.
	const gaps = values
		.slice(1)
		.map((v, i) => v - values[i])
		.filter((g) => g > 0)
		.sort((a, b) => a - b);
	const median = gaps.length ? gaps[gaps.length >> 1] : 0;
	return median >= 40
		? { unit: 'us', epoch: false, why: `whole numbers about ${median} apart` }
		: { unit: 'ms', epoch: false, why: `whole numbers about ${median} apart` };
}

const DELIMITER_NAMES: Record<string, string> = {
	',': 'comma',
	';': 'semicolon',
	'\t': 'tab',
	'|': 'vertical bar'
};
const UNIT_NAMES: Record<TimeUnit, string> = {
	s: 'seconds',
	ms: 'milliseconds',
	us: 'microseconds'
};

/** Reads the first rows of `sample` (whole lines) and returns the most likely layout. */
export function detectCaptureLayout(sample: string): LayoutGuess {
	const parsed = Papa.parse<string[]>(sample.replace(/^\ufeff/, ''), {
		preview: SAMPLE_ROWS + 1,
		skipEmptyLines: 'greedy',
		delimitersToGuess: [...CAPTURE_DELIMITERS]
	});
	const rows = parsed.data;
	if (rows.length === 0)
		throw new CaptureFormatError('The capture is empty: it has no rows to read.');
	const delimiter = (CAPTURE_DELIMITERS as readonly string[]).includes(parsed.meta.delimiter)
		? (parsed.meta.delimiter as CaptureLayout['delimiter'])
		: ',';
	const hasHeader = !Number.isFinite(parseTime(rows[0][0] ?? ''));
	const dataRows = hasHeader ? rows.slice(1) : rows;
	const notes = [`Delimiter: ${DELIMITER_NAMES[delimiter]}.`];

	let candidates: Columns[];
	let hintedUnit: TimeUnit | null = null;
	// A named ID column is hex (the canonical layout) unless its name says decimal; unnamed, try both.
	let idFormats: CaptureLayout['idFormat'][] = ['hex', 'decimal'];
	const header = hasHeader ? mapHeader(rows[0]) : null;
	if (
		header &&
		header.time !== null &&
		header.id !== null &&
		(header.data !== null || header.bytes.length > 0)
	) {
		candidates = [
			{
				timeColumn: header.time,
				idColumn: header.id,
				extendedColumn: header.extended,
				dlcColumn: header.dlc,
				dataColumn: header.data,
				byteColumns: header.data === null ? header.bytes : []
			}
		];
		hintedUnit = header.timeUnit;
		idFormats = [header.idDecimal ? 'decimal' : 'hex'];
		notes.push(
			`Header row: yes; columns found by name (${rows[0].map((h) => h.trim()).join(', ')}).`
		);
	} else {
		if (dataRows.length === 0) {
			throw new CaptureFormatError(
				`The capture has only a header row and its column names were not recognised; expected ${'time,id,extended,dlc,data'}.`
			);
		}
		const columnCount = Math.max(...dataRows.map((r) => r.length));
		if (columnCount < 3) {
			throw new CaptureFormatError(
				`Each row needs at least a time, an ID and data, but the rows have ${columnCount} column(s) with a ${DELIMITER_NAMES[delimiter]} delimiter.`
			);
		}
		candidates = positionalCandidates(columnCount);
		notes.push(
			hasHeader
				? 'Header row: yes, but its names were not recognised; columns guessed from their contents.'
				: 'Header row: none; columns guessed from their contents.'
		);
	}

	// Score every candidate (and both ID notations) by how many sample rows it reads; first wins ties.
	const out = createParsedRow();
	const timeTexts = dataRows.map((r) => r[candidates[0].timeColumn] ?? '');
	const time = guessTimeUnit(timeTexts, hintedUnit);
	let best: { layout: CaptureLayout; score: number; firstProblem: string | null } | null = null;
	for (const columns of candidates) {
		for (const idFormat of idFormats) {
			const layout: CaptureLayout = {
				delimiter,
				hasHeader,
				...columns,
				timeUnit: time.unit,
				epochTime: time.epoch,
				idFormat,
				dlcMeaning: 'either'
			};
			const parse = createRowParser(layout);
			let score = 0;
			let firstProblem: string | null = null;
			dataRows.forEach((row, i) => {
				const problem = parse(row, out);
				if (problem === null) score++;
				else firstProblem ??= `row ${i + 1 + (hasHeader ? 1 : 0)}: ${problem}`;
			});
			if (!best || score > best.score) best = { layout, score, firstProblem };
		}
	}
	if (!best || (dataRows.length > 0 && best.score === 0)) {
		throw new CaptureFormatError(
			`Could not recognise the capture's columns (${best?.firstProblem ?? 'no rows'}). Expected ${'time,id,extended,dlc,data'} or a close variant.`
		);
	}
	const layout = captureLayoutSchema.parse(best.layout);
	notes.push(
		`Time: column ${layout.timeColumn + 1}, ${UNIT_NAMES[layout.timeUnit]}${layout.epochTime ? ' since 1970 (wall-clock), made relative to the first frame' : ''} — judged by ${time.why}.`,
		`ID: column ${layout.idColumn + 1}, ${layout.idFormat === 'hex' ? 'hexadecimal' : 'decimal'}.`,
		layout.extendedColumn === null
			? 'Extended flag: no column; IDs above 0x7FF are taken as extended (29-bit).'
			: `Extended flag: column ${layout.extendedColumn + 1}.`,
		layout.dlcColumn === null
			? 'DLC: no column; the data decides the length.'
			: `DLC: column ${layout.dlcColumn + 1}.`,
		layout.dataColumn !== null
			? `Data: column ${layout.dataColumn + 1}, hex bytes.`
			: `Data: one byte per column, columns ${layout.byteColumns[0] + 1}–${layout.byteColumns[layout.byteColumns.length - 1] + 1}.`
	);
	if (dataRows.length > 0 && best.score < dataRows.length) {
		notes.push(
			`${dataRows.length - best.score} of the ${dataRows.length} sample rows do not fit this layout (first: ${best.firstProblem}).`
		);
	}
	return { layout, notes };
}
