/**
 * The CSV signal table: one row per signal, the frame's columns repeated on each of its rows, so a
 * map can be written in any spreadsheet. Our own column names; labels as `0=Off;1=On`.
 * A frame without signals is one row with the signal columns left blank. On the second and later
 * rows of a frame, a blank frame column means "as above"; a filled one must agree with it.
 * Alert rules are not part of the table: writing leaves them out and reading gives a map without
 * any (the import help says so); the JSON format carries them.
 */
import type { z } from 'zod';
import { csvRow, readCsvText } from './csv-cell';
import { readCsvRecords, type CsvRecord } from './csv-records';
import {
	canIdSchema,
	canMapSchema,
	frameSchema,
	MAP_FORMAT,
	MAX_STANDARD_ID,
	signalSchema,
	type CanMap,
	type Frame,
	type FrameInput,
	type Signal,
	type SignalInput
} from './map';
import { formatCanId } from './map-json';

type FrameField = Exclude<keyof Frame, 'signals'>;
type ColumnSpec =
	| { name: string; level: 'frame'; field: FrameField; kind: Kind; description: string }
	| { name: string; level: 'signal'; field: keyof Signal; kind: Kind; description: string };
type Kind = 'text' | 'number' | 'nullableNumber' | 'boolean' | 'id' | 'labels';

/** Every column, in file order, with what it means (shown in the import help). */
export const SIGNAL_TABLE_COLUMNS: readonly ColumnSpec[] = [
	{ name: 'frame_name', level: 'frame', field: 'name', kind: 'text', description: 'Frame name' },
	{
		name: 'frame_id',
		level: 'frame',
		field: 'id',
		kind: 'id',
		description: 'CAN ID, hex like 0x360 or a decimal number'
	},
	{
		name: 'extended',
		level: 'frame',
		field: 'extended',
		kind: 'boolean',
		description: '1 for a 29-bit ID, 0 for 11-bit; blank: 1 when the ID is above 0x7FF'
	},
	{
		name: 'length',
		level: 'frame',
		field: 'length',
		kind: 'number',
		description: 'Payload bytes (0–8, or CAN FD 12–64); blank: 8'
	},
	{
		name: 'cycle_ms',
		level: 'frame',
		field: 'cycleMs',
		kind: 'nullableNumber',
		description: 'Cycle time in milliseconds; blank if sent on event'
	},
	{
		name: 'sender',
		level: 'frame',
		field: 'sender',
		kind: 'text',
		description: 'Device that sends the frame'
	},
	{
		name: 'j1939',
		level: 'frame',
		field: 'j1939',
		kind: 'boolean',
		description: '1 to match any ID with the same J1939 PGN'
	},
	{
		name: 'signal_name',
		level: 'signal',
		field: 'name',
		kind: 'text',
		description: 'Signal name; blank for a frame without signals'
	},
	{
		name: 'start_bit',
		level: 'signal',
		field: 'startBit',
		kind: 'number',
		description: 'Position of the least significant bit (bit b = bit b % 8 of byte b / 8)'
	},
	{
		name: 'bit_length',
		level: 'signal',
		field: 'length',
		kind: 'number',
		description: 'Length in bits, 1–64'
	},
	{
		name: 'byte_order',
		level: 'signal',
		field: 'byteOrder',
		kind: 'text',
		description: 'little or big; blank: little'
	},
	{
		name: 'value_type',
		level: 'signal',
		field: 'valueType',
		kind: 'text',
		description: 'unsigned, signed, float32 or float64; blank: unsigned'
	},
	{
		name: 'scale',
		level: 'signal',
		field: 'scale',
		kind: 'number',
		description: 'physical = raw × scale + offset; blank: 1'
	},
	{ name: 'offset', level: 'signal', field: 'offset', kind: 'number', description: 'blank: 0' },
	{
		name: 'unit',
		level: 'signal',
		field: 'unit',
		kind: 'text',
		description: 'Physical unit, e.g. kPa'
	},
	{
		name: 'min',
		level: 'signal',
		field: 'min',
		kind: 'nullableNumber',
		description: 'Lowest valid physical value; blank for none'
	},
	{
		name: 'max',
		level: 'signal',
		field: 'max',
		kind: 'nullableNumber',
		description: 'Highest valid physical value; blank for none'
	},
	{
		name: 'labels',
		level: 'signal',
		field: 'labels',
		kind: 'labels',
		description: 'Raw value names, e.g. 0=Off;1=On (write \\; or \\= inside a name)'
	},
	{
		name: 'multiplexer',
		level: 'signal',
		field: 'multiplexer',
		kind: 'boolean',
		description: '1 if this signal selects the page of the others'
	},
	{
		name: 'mux_value',
		level: 'signal',
		field: 'muxValue',
		kind: 'nullableNumber',
		description: 'Page on which this signal is present; blank: always'
	},
	{
		name: 'spn',
		level: 'signal',
		field: 'spn',
		kind: 'nullableNumber',
		description: 'J1939 suspect parameter number; blank for none'
	},
	{
		name: 'role',
		level: 'signal',
		field: 'role',
		kind: 'text',
		description: 'value, counter or checksum (docs/map-format.md, "Signal roles"); blank: value'
	},
	{
		name: 'comment',
		level: 'signal',
		field: 'comment',
		kind: 'text',
		description: 'Signal comment'
	},
	{
		name: 'frame_comment',
		level: 'frame',
		field: 'comment',
		kind: 'text',
		description: 'Frame comment'
	}
];

const REQUIRED_COLUMNS = ['frame_name', 'frame_id', 'signal_name', 'start_bit', 'bit_length'];

export interface SignalTableProblem {
	/** 1-based line in the file (the header is line 1 of a typical file). */
	line: number;
	column?: string;
	message: string;
}

export type ParseSignalTableResult =
	{ ok: true; map: CanMap } | { ok: false; problems: SignalTableProblem[] };

export interface SignalTableOptions {
	/** The map's name (the table itself carries none). */
	name?: string;
	bitrate?: number;
}

// ---------------------------------------------------------------- writing

export function labelsText(labels: Record<string, string>): string {
	const escape = (s: string) => s.replace(/[\\;=]/g, (c) => `\\${c}`);
	return Object.entries(labels)
		.sort(([a], [b]) => Number(a) - Number(b))
		.map(([raw, name]) => `${raw}=${escape(name)}`)
		.join(';');
}

/** A cell's value: numbers stay numbers and text stays text, so `csvRow` neutralises only text. */
function cellValue(spec: ColumnSpec, value: unknown, frame: Frame): string | number | null {
	if (value === null || value === undefined) return null;
	switch (spec.kind) {
		case 'id':
			return formatCanId(value as number, frame.extended);
		case 'boolean':
			return value ? '1' : '0';
		case 'labels':
			return labelsText(value as Record<string, string>);
		case 'number':
		case 'nullableNumber':
			return value as number; // JavaScript's shortest round-trip form for numbers
		default:
			return String(value);
	}
}

export function writeSignalTable(map: CanMap): string {
	const lines = [csvRow(SIGNAL_TABLE_COLUMNS.map((c) => c.name))];
	for (const frame of map.frames) {
		const rows: (Signal | null)[] = frame.signals.length > 0 ? frame.signals : [null];
		for (const signal of rows) {
			lines.push(
				csvRow(
					SIGNAL_TABLE_COLUMNS.map((spec) => {
						if (spec.level === 'frame') return cellValue(spec, frame[spec.field], frame);
						return signal ? cellValue(spec, signal[spec.field], frame) : null;
					})
				)
			);
		}
	}
	return `${lines.join('\r\n')}\r\n`; // CRLF line ends, as RFC 4180 specifies
}

/** A starting file for the import: the header and an invented example frame. */
export function signalTableTemplate(): string {
	const example: CanMap = canMapSchema.parse({
		format: MAP_FORMAT,
		name: 'Example',
		frames: [
			{
				name: 'ExampleEngine',
				id: '0x360',
				length: 8,
				cycleMs: 20,
				sender: 'ECU',
				comment: 'Replace these rows with your own frames',
				signals: [
					{
						name: 'EngineSpeed',
						startBit: 8,
						length: 16,
						byteOrder: 'big',
						unit: 'rpm',
						min: 0,
						max: 9000
					},
					{
						name: 'CoolantTemp',
						startBit: 16,
						length: 8,
						offset: -40,
						unit: '°C',
						min: -40,
						max: 120
					},
					{
						name: 'FanState',
						startBit: 24,
						length: 2,
						labels: { '0': 'Off', '1': 'Low', '2': 'High' }
					}
				]
			}
		]
	});
	return writeSignalTable(example);
}

// ---------------------------------------------------------------- reading

type Cells = Map<string, string>;

interface Cell {
	ok: boolean;
	value?: unknown;
	message?: string;
}

const BOOLEAN_WORDS: Record<string, boolean> = {
	'1': true,
	'0': false,
	true: true,
	false: false,
	yes: true,
	no: false
};

export function readLabels(text: string): Cell {
	const labels: Record<string, string> = {};
	// Split on separators that are not escaped with a backslash.
	const parts = text.match(/(?:\\.|[^;\\])+/g) ?? [];
	for (const part of parts) {
		const eq = part.search(/(?<!\\)=/);
		if (eq < 0)
			return { ok: false, message: `"${part}" is not raw=name (write labels like 0=Off;1=On)` };
		const raw = part.slice(0, eq).trim();
		if (!/^-?\d+$/.test(raw))
			return { ok: false, message: `label key "${raw}" must be a whole raw value` };
		labels[String(Number(raw))] = part.slice(eq + 1).replace(/\\(.)/g, '$1');
	}
	return { ok: true, value: labels };
}

/** Blank cells are left out (so zod applies its default); other text is converted by kind. */
function readCell(spec: ColumnSpec, field: string): Cell {
	// Undo the formula guard of our own writer (`'=…` back to `=…`, src/lib/can/csv-cell.ts).
	const raw = readCsvText(field);
	const text = raw.trim();
	if (text === '') return { ok: true, value: spec.kind === 'nullableNumber' ? null : undefined };
	switch (spec.kind) {
		case 'text':
			return { ok: true, value: raw }; // verbatim: the writer quotes edge spaces, so they survive
		case 'id':
			return {
				ok: true,
				value: /^0x/i.test(text) ? text : /^\d+$/.test(text) ? Number(text) : text
			};
		case 'number':
		case 'nullableNumber': {
			const n = Number(text);
			return Number.isFinite(n)
				? { ok: true, value: n }
				: { ok: false, message: `expected a number, got "${text}"` };
		}
		case 'boolean': {
			const b = BOOLEAN_WORDS[text.toLowerCase()];
			return b === undefined
				? { ok: false, message: `expected 1 or 0, got "${text}"` }
				: { ok: true, value: b };
		}
		case 'labels':
			return readLabels(raw);
	}
}

function columnOf(level: 'frame' | 'signal', field: PropertyKey | undefined): string | undefined {
	return SIGNAL_TABLE_COLUMNS.find((c) => c.level === level && c.field === field)?.name;
}

function zodProblems(
	error: z.ZodError,
	line: number,
	level: 'frame' | 'signal'
): SignalTableProblem[] {
	return error.issues.map((issue) => {
		const field = issue.path[0];
		const keys = issue.code === 'unrecognized_keys' ? issue.keys : [];
		return {
			line,
			column: columnOf(level, field),
			message: [issue.message.replace(/^Invalid input: /, ''), ...keys].join(' ')
		};
	});
}

interface Header {
	columns: string[];
	problems: SignalTableProblem[];
}

function readHeader(record: CsvRecord): Header {
	const columns = record.fields.map((f) => f.trim().toLowerCase());
	const problems: SignalTableProblem[] = [];
	const known = new Set(SIGNAL_TABLE_COLUMNS.map((c) => c.name));
	columns.forEach((name, i) => {
		if (!known.has(name))
			problems.push({
				line: record.line,
				column: name || `#${i + 1}`,
				message: `unknown column "${name}"; the columns are ${[...known].join(', ')}`
			});
		else if (columns.indexOf(name) !== i)
			problems.push({ line: record.line, column: name, message: `column "${name}" appears twice` });
	});
	for (const name of REQUIRED_COLUMNS) {
		if (!columns.includes(name))
			problems.push({
				line: record.line,
				column: name,
				message: `the header lacks the required column "${name}"`
			});
	}
	return { columns, problems };
}

interface FrameDraft {
	line: number;
	values: Record<string, unknown>;
	signals: { line: number; input: SignalInput }[];
}

function readRow(
	cells: Cells,
	line: number,
	problems: SignalTableProblem[]
): { frame: Record<string, unknown>; signal: Record<string, unknown> | null } {
	const frame: Record<string, unknown> = {};
	const signal: Record<string, unknown> = {};
	let signalCells = 0;
	for (const spec of SIGNAL_TABLE_COLUMNS) {
		const raw = cells.get(spec.name);
		if (raw === undefined) continue;
		const cell = readCell(spec, raw);
		if (!cell.ok) {
			problems.push({ line, column: spec.name, message: cell.message ?? 'invalid' });
			continue;
		}
		if (spec.level === 'frame') frame[spec.field] = cell.value;
		else {
			if (raw.trim() !== '') signalCells++;
			signal[spec.field] = cell.value;
		}
	}
	if (signalCells === 0) return { frame, signal: null };
	if (signal.name === undefined)
		problems.push({
			line,
			column: 'signal_name',
			message: 'this row has signal columns but no signal name'
		});
	return { frame, signal };
}

export function parseSignalTable(
	text: string,
	options: SignalTableOptions = {}
): ParseSignalTableResult {
	const records = readCsvRecords(text);
	if (records.length === 0)
		return {
			ok: false,
			problems: [
				{ line: 1, message: 'the file is empty; it needs a header row and one row per signal' }
			]
		};
	const header = readHeader(records[0]);
	if (header.problems.length > 0) return { ok: false, problems: header.problems };

	const problems: SignalTableProblem[] = [];
	const frames = new Map<string, FrameDraft>();
	for (const record of records.slice(1)) {
		if (record.fields.length !== header.columns.length) {
			problems.push({
				line: record.line,
				message: `has ${record.fields.length} fields but the header has ${header.columns.length}`
			});
			continue;
		}
		const cells: Cells = new Map(header.columns.map((name, i) => [name, record.fields[i]]));
		const before = problems.length;
		const row = readRow(cells, record.line, problems);
		if (problems.length > before) continue;

		const id = canIdSchema.safeParse(row.frame.id);
		if (!id.success) {
			problems.push({
				line: record.line,
				column: 'frame_id',
				message:
					row.frame.id === undefined ? 'every row needs the frame ID' : id.error.issues[0].message
			});
			continue;
		}
		// Like the capture CSV: an ID that does not fit 11 bits must be extended.
		const extended = (row.frame.extended as boolean | undefined) ?? id.data > MAX_STANDARD_ID;
		const key = formatCanId(id.data, extended);
		const known = frames.get(key);
		if (!known) {
			frames.set(key, {
				line: record.line,
				values: { ...row.frame, id: id.data, extended },
				signals: []
			});
		} else {
			for (const [field, value] of Object.entries(row.frame)) {
				if (value === undefined || value === null || field === 'id' || field === 'extended')
					continue;
				if (JSON.stringify(known.values[field]) !== JSON.stringify(value)) {
					problems.push({
						line: record.line,
						column: columnOf('frame', field),
						message: `frame ${key} has ${JSON.stringify(known.values[field] ?? '')} here on line ${known.line}; repeat it exactly or leave the cell blank`
					});
				}
			}
		}
		if (row.signal)
			frames.get(key)!.signals.push({ line: record.line, input: row.signal as SignalInput });
	}

	const built: FrameInput[] = [];
	for (const draft of frames.values()) {
		const signals: Signal[] = [];
		for (const { line, input } of draft.signals) {
			const parsed = signalSchema.safeParse(input);
			if (parsed.success) signals.push(parsed.data);
			else problems.push(...zodProblems(parsed.error, line, 'signal'));
		}
		const frame = frameSchema.safeParse({ ...draft.values, signals: [] });
		if (!frame.success) problems.push(...zodProblems(frame.error, draft.line, 'frame'));
		else built.push({ ...frame.data, signals });
	}
	if (problems.length > 0) return { ok: false, problems: problems.sort((a, b) => a.line - b.line) };

	const map = canMapSchema.safeParse({
		format: MAP_FORMAT,
		name: options.name ?? 'Imported signal table',
		bitrate: options.bitrate,
		frames: built
	});
	if (!map.success)
		return {
			ok: false,
			problems: map.error.issues.map((i) => ({
				line: 1,
				message: `${i.path.join('.')}: ${i.message}`
			}))
		};
	return { ok: true, map: map.data };
}
