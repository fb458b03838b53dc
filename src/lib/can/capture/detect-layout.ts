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
import {
	createParsedRow,
	createRowParser,
	idNotationOf,
	parseDirection,
	parseKind,
	parseTime,
	timeFormatOf
} from './row-parser';

/** A problem with the capture as a whole (not one row): empty, unreadable columns, … */
export class CaptureFormatError extends Error {
	override name = 'CaptureFormatError';
}

export interface LayoutGuess {
	layout: CaptureLayout;
	/** One sentence per decision, for the confirmation screen and the CLI's stderr. */
	notes: string[];
	/**
	 * Set when no arrangement read a single sample row: the layout is only a starting point and the
	 * person maps the columns by hand on the confirmation screen (the upload is kept). One sentence.
	 */
	problem: string | null;
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
const BUS_NAMES = new Set([
	'bus',
	'channel',
	'chan',
	'ch',
	'chn',
	'port',
	'interface',
	'iface',
	'network',
	'net',
	'busname',
	'busid'
]);
const DIRECTION_NAMES = new Set(['dir', 'direction', 'rxtx', 'txrx', 'io']);
const KIND_NAMES = new Set(['type', 'kind', 'frametype', 'msgtype', 'messagetype', 'frame']);
const TAG_NAMES = new Set([
	'flag',
	'flags',
	'label',
	'tag',
	'note',
	'notes',
	'comment',
	'info',
	'marker',
	'event'
]);

function unitFromSuffix(suffix: string): TimeUnit | null {
	if (/^(ns|nsec|nano)/.test(suffix)) return 'ns';
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
	bus: number | null;
	direction: number | null;
	kind: number | null;
	tag: number | null;
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
		bytes: [],
		bus: null,
		direction: null,
		kind: null,
		tag: null
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
		else if (m.bus === null && BUS_NAMES.has(name)) m.bus = column;
		else if (m.direction === null && DIRECTION_NAMES.has(name)) m.direction = column;
		else if (m.kind === null && KIND_NAMES.has(name)) m.kind = column;
		else if (m.tag === null && TAG_NAMES.has(name)) m.tag = column;
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
	| 'timeColumn'
	| 'idColumn'
	| 'extendedColumn'
	| 'dlcColumn'
	| 'dataColumn'
	| 'byteColumns'
	| 'busColumn'
	| 'directionColumn'
	| 'kindColumn'
	| 'tagColumn'
>;

const NO_EXTRAS = { busColumn: null, directionColumn: null, kindColumn: null, tagColumn: null };

/** Column arrangements to try when the header does not say, most usual first. */
function positionalCandidates(columnCount: number): Columns[] {
	const out: Columns[] = [];
	for (const extendedColumn of [2, null]) {
		const afterFlag = extendedColumn === null ? 2 : 3;
		for (const dlcColumn of [afterFlag, null]) {
			const dataStart = dlcColumn === null ? afterFlag : afterFlag + 1;
			if (dataStart >= columnCount) continue;
			const base = { timeColumn: 0, idColumn: 1, extendedColumn, dlcColumn, ...NO_EXTRAS };
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
		const seconds = first * { s: 1, ms: 1e-3, us: 1e-6, ns: 1e-9 }[hinted];
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
	if (first >= 1e18 && first < 1e19)
		return { unit: 'ns', epoch: true, why: 'the size of the values' };
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

const CANONICAL_NAMES = 'time,id,extended,dlc,data';

const DELIMITER_NAMES: Record<string, string> = {
	',': 'comma',
	';': 'semicolon',
	'\t': 'tab',
	'|': 'vertical bar'
};
const UNIT_NAMES: Record<TimeUnit, string> = {
	s: 'seconds',
	ms: 'milliseconds',
	us: 'microseconds',
	ns: 'nanoseconds'
};

/** The notation most of `texts` are written in (numbers win ties: they are the usual case). */
function timeFormatOfColumn(texts: string[]): CaptureLayout['timeFormat'] {
	const counts = { number: 0, 'time-of-day': 0, 'date-time': 0 };
	for (const t of texts) {
		const f = timeFormatOf(t);
		if (f) counts[f]++;
	}
	if (counts['time-of-day'] > counts.number && counts['time-of-day'] >= counts['date-time'])
		return 'time-of-day';
	if (counts['date-time'] > counts.number) return 'date-time';
	return 'number';
}

/** The most common ID notation of the sample, in words; null when none reads. */
function idNotationOfColumn(texts: string[]): string | null {
	const counts = new Map<string, number>();
	for (const t of texts) {
		const n = idNotationOf(t);
		if (n) counts.set(n, (counts.get(n) ?? 0) + 1);
	}
	return [...counts].sort((a, b) => b[1] - a[1])[0]?.[0] ?? null;
}

/**
 * Gives roles to columns the chosen layout leaves unread: a column of frame-kind words becomes the
 * kind column, one of Rx/Tx the direction; with one column per byte and a DLC, text right after
 * each row's bytes is a tag (rows of varying width), so the byte columns stop at the longest payload.
 */
function assignTrailingColumns(layout: CaptureLayout, rows: string[][]): CaptureLayout {
	if (rows.length === 0) return layout;
	const out = createParsedRow();
	const parse = createRowParser(layout);
	let next = { ...layout };
	if (layout.dataColumn === null && layout.dlcColumn !== null && layout.tagColumn === null) {
		let longest = 0;
		let tagged = 0;
		for (const row of rows) {
			if (parse(row, out) !== null) continue;
			longest = Math.max(longest, out.length);
			const after = layout.byteColumns[0] + out.length;
			if ((row[after] ?? '').trim() !== '') tagged++;
		}
		if (tagged > 0) {
			next = {
				...next,
				byteColumns: layout.byteColumns.slice(0, longest),
				tagColumn: 'after-bytes'
			};
		}
		return next;
	}
	if (layout.dataColumn === null) return next;
	const used = Math.max(
		layout.timeColumn,
		layout.idColumn,
		layout.extendedColumn ?? 0,
		layout.dlcColumn ?? 0,
		layout.dataColumn
	);
	const width = Math.max(...rows.map((r) => r.length));
	for (let c = used + 1; c < width; c++) {
		const texts = rows.map((r) => (r[c] ?? '').trim()).filter((t) => t !== '');
		if (texts.length === 0) continue;
		if (next.kindColumn === null && texts.every((t) => parseKind(t) !== undefined))
			next = { ...next, kindColumn: c };
		else if (next.directionColumn === null && texts.every((t) => parseDirection(t) !== undefined))
			next = { ...next, directionColumn: c };
		else if (next.tagColumn === null) next = { ...next, tagColumn: c };
	}
	return next;
}

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
	const hasHeader = timeFormatOf(rows[0][0] ?? '') === null;
	const dataRows = hasHeader ? rows.slice(1) : rows;
	const notes = [`Delimiter: ${DELIMITER_NAMES[delimiter]}.`];

	let candidates: Columns[];
	let hintedUnit: TimeUnit | null = null;
	// A named ID column is hex (the canonical layout) unless its name says decimal; unnamed, try both.
	let idFormats: CaptureLayout['idFormat'][] = ['hex', 'decimal'];
	const header = hasHeader ? mapHeader(rows[0]) : null;
	let problem: string | null = null;
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
				byteColumns: header.data === null ? header.bytes : [],
				busColumn: header.bus,
				directionColumn: header.direction,
				kindColumn: header.kind,
				tagColumn: header.tag
			}
		];
		hintedUnit = header.timeUnit;
		idFormats = [header.idDecimal ? 'decimal' : 'hex'];
		notes.push(
			`Header row: yes; columns found by name (${rows[0].map((h) => h.trim()).join(', ')}).`
		);
	} else {
		const columnCount = Math.max(0, ...dataRows.map((r) => r.length));
		if (dataRows.length === 0) {
			problem = `the file has only a header row and its column names were not recognised; expected ${CANONICAL_NAMES}`;
		} else if (columnCount < 3) {
			problem = `each row needs at least a time, an ID and data, but the rows have ${columnCount} column(s) with a ${DELIMITER_NAMES[delimiter]} delimiter`;
		}
		candidates = problem
			? [
					{
						timeColumn: 0,
						idColumn: Math.min(1, columnCount - 1),
						extendedColumn: null,
						dlcColumn: null,
						dataColumn: Math.max(0, columnCount - 1),
						byteColumns: [],
						...NO_EXTRAS
					}
				]
			: positionalCandidates(columnCount);
		notes.push(
			hasHeader
				? 'Header row: yes, but its names were not recognised; columns guessed from their contents.'
				: 'Header row: none; columns guessed from their contents.'
		);
	}

	// Score every candidate (and both ID notations) by how many sample rows it reads; first wins ties.
	const out = createParsedRow();
	const timeTexts = dataRows.map((r) => r[candidates[0].timeColumn] ?? '');
	const timeFormat = timeFormatOfColumn(timeTexts);
	const time =
		timeFormat === 'number'
			? guessTimeUnit(timeTexts, hintedUnit)
			: { unit: 's' as const, epoch: timeFormat === 'date-time', why: 'how the times are written' };
	let best: { layout: CaptureLayout; score: number; firstProblem: string | null } | null = null;
	for (const columns of candidates) {
		for (const idFormat of idFormats) {
			const layout: CaptureLayout = {
				delimiter,
				hasHeader,
				...columns,
				timeUnit: time.unit,
				timeFormat,
				epochTime: time.epoch,
				idFormat,
				dlcMeaning: 'either'
			};
			const parse = createRowParser(layout);
			let score = 0;
			let firstProblem: string | null = null;
			dataRows.forEach((row, i) => {
				const rowProblem = parse(row, out);
				if (rowProblem === null) score++;
				else firstProblem ??= `row ${i + 1 + (hasHeader ? 1 : 0)}: ${rowProblem}`;
			});
			if (!best || score > best.score) best = { layout, score, firstProblem };
		}
	}
	const chosen = best!;
	if (problem === null && dataRows.length > 0 && chosen.score === 0)
		problem = `Could not recognise the capture's columns (${chosen.firstProblem}). Expected ${CANONICAL_NAMES} or a close variant.`;
	else if (problem !== null) problem = `Could not recognise the capture's columns: ${problem}.`;
	const recognised = problem === null;
	const layout = captureLayoutSchema.parse(
		recognised ? assignTrailingColumns(chosen.layout, dataRows) : chosen.layout
	);
	if (!recognised) {
		notes.push(
			`${problem} The file is kept: give each column its role below and the preview reads the rows again.`
		);
	}
	const idNotation = idNotationOfColumn(dataRows.map((r) => r[layout.idColumn] ?? ''));
	notes.push(
		layout.timeFormat === 'number'
			? `Time: column ${layout.timeColumn + 1}, ${UNIT_NAMES[layout.timeUnit]}${layout.epochTime ? ' since 1970 (wall-clock), made relative to the first frame' : ''} — judged by ${time.why}.`
			: layout.timeFormat === 'time-of-day'
				? `Time: column ${layout.timeColumn + 1}, time of day (hh:mm:ss); a jump back of more than 12 hours is read as passing midnight.`
				: `Time: column ${layout.timeColumn + 1}, ISO 8601 date and time (UTC unless an offset is written).`,
		`ID: column ${layout.idColumn + 1}, ${layout.idFormat === 'hex' ? 'hexadecimal' : 'decimal'}${idNotation ? ` (written as ${idNotation})` : ''}.`,
		layout.extendedColumn === null
			? 'Extended flag: no column; IDs above 0x7FF (or marked with a trailing x) are taken as extended (29-bit).'
			: `Extended flag: column ${layout.extendedColumn + 1}.`,
		layout.dlcColumn === null
			? 'DLC: no column; the data decides the length.'
			: `DLC: column ${layout.dlcColumn + 1}.`,
		layout.dataColumn !== null
			? `Data: column ${layout.dataColumn + 1}, hex bytes.`
			: `Data: one byte per column, columns ${layout.byteColumns[0] + 1}–${layout.byteColumns[layout.byteColumns.length - 1] + 1}.`
	);
	if (layout.busColumn !== null) notes.push(`Bus: column ${layout.busColumn + 1}.`);
	if (layout.directionColumn !== null)
		notes.push(`Direction (Rx/Tx): column ${layout.directionColumn + 1}.`);
	if (layout.kindColumn !== null)
		notes.push(`Frame kind (data, remote, error): column ${layout.kindColumn + 1}.`);
	if (layout.tagColumn === 'after-bytes')
		notes.push(
			'Tag: the text right after each row’s data bytes (rows of varying width) is kept as the frame’s tag, not read as a byte.'
		);
	else if (layout.tagColumn !== null)
		notes.push(`Tag: column ${layout.tagColumn + 1} is kept as each frame’s tag.`);
	if (recognised && dataRows.length > 0 && chosen.score < dataRows.length) {
		notes.push(
			`${dataRows.length - chosen.score} of the ${dataRows.length} sample rows do not fit this layout (first: ${chosen.firstProblem}).`
		);
	}
	return { layout, notes, problem };
}
