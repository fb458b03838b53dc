/**
 * The layout confirmation screen's model: the importer's guess applied to the file's first rows, so
 * the person sees what each column will be read as — and which rows would be refused, and why —
 * before the whole file is processed. Reads rows with the core's own row parser, so the preview and
 * the processing cannot disagree.
 */
import Papa from 'papaparse';
import { formatCanId } from '$lib/can/map-json';
import {
	captureLayoutSchema,
	secondsPerTimeUnit,
	unusedColumns,
	type CaptureLayout
} from '$lib/can/capture/layout';
import { createParsedRow, createRowParser } from '$lib/can/capture/row-parser';

export interface PreviewRow {
	/** Line number in the file (1-based). */
	line: number;
	fields: string[];
	frame: { time: number; id: string; extended: boolean; length: number; dataHex: string } | null;
	/** Why processing would list this row as bad; null when it reads. */
	error: string | null;
}

/**
 * The sample re-split with another delimiter. The server split the first rows with the detected one;
 * joining with it gives the lines back (quoted fields holding that delimiter aside, which a capture
 * of hex and numbers does not have).
 */
export function resplitSample(rows: string[][], from: string, to: string): string[][] {
	if (from === to) return rows;
	const text = rows.map((r) => r.join(from)).join('\n');
	return Papa.parse<string[]>(text, { delimiter: to, skipEmptyLines: true }).data;
}

export const columnCount = (rows: string[][]) => rows.reduce((n, r) => Math.max(n, r.length), 0);

/** What each column will be read as, for the table's header ("time (ms)", "ID (hex)", "byte 2", …). */
export function columnRoles(layout: CaptureLayout, count: number): (string | null)[] {
	const roles: (string | null)[] = Array.from({ length: count }, () => null);
	const put = (column: number | null, role: string) => {
		if (column === null || column >= count) return;
		roles[column] = roles[column] ? `${roles[column]} + ${role}` : role;
	};
	put(
		layout.timeColumn,
		layout.timeFormat === 'number'
			? `time (${layout.timeUnit}${layout.epochTime ? ', epoch' : ''})`
			: `time (${layout.timeFormat})`
	);
	put(layout.idColumn, `ID (${layout.idFormat})`);
	put(layout.extendedColumn, 'extended flag');
	put(
		layout.dlcColumn,
		`DLC (${layout.dlcMeaning === 'code' ? 'length code' : layout.dlcMeaning === 'bytes' ? 'byte count' : 'code or bytes'})`
	);
	put(layout.dataColumn, 'data (hex bytes)');
	layout.byteColumns.forEach((c, k) => put(c, `byte ${k}`));
	put(layout.busColumn, 'bus');
	put(layout.directionColumn, 'direction');
	put(layout.kindColumn, 'frame kind');
	if (typeof layout.tagColumn === 'number') put(layout.tagColumn, 'tag');
	for (const c of unusedColumns(layout, count)) roles[c] ??= 'ignored';
	return roles;
}

/** Choices for a column picker: "1 · time" with the header's name when the file has one. */
export function columnChoices(
	rows: string[][],
	layout: Pick<CaptureLayout, 'hasHeader'>
): { value: number; label: string }[] {
	const header = layout.hasHeader ? (rows[0] ?? []) : [];
	return Array.from({ length: columnCount(rows) }, (_, c) => {
		const name = header[c]?.trim();
		return { value: c, label: name ? `${c + 1} · ${name}` : `column ${c + 1}` };
	});
}

/** The rows after the header as processing would read them; times in seconds from the first good row. */
export function previewRows(layout: CaptureLayout, rows: string[][]): PreviewRow[] {
	if (!captureLayoutSchema.safeParse(layout).success) return [];
	const parse = createRowParser(layout);
	const parsed = createParsedRow();
	const first = layout.hasHeader ? 1 : 0;
	let origin: number | null = null;
	const out: PreviewRow[] = [];
	for (let r = first; r < rows.length; r++) {
		const fields = rows[r];
		const error = parse(fields, parsed);
		if (error !== null) {
			out.push({ line: r + 1, fields, frame: null, error });
			continue;
		}
		const seconds = parsed.time * secondsPerTimeUnit(layout);
		origin ??= seconds;
		const bytes = Array.from(parsed.data.subarray(0, parsed.length), (b) =>
			b.toString(16).toUpperCase().padStart(2, '0')
		);
		out.push({
			line: r + 1,
			fields,
			frame: {
				time: seconds - origin,
				id: formatCanId(parsed.id, parsed.extended),
				extended: parsed.extended,
				length: parsed.length,
				dataHex: bytes.join(' ')
			},
			error: null
		});
	}
	return out;
}

/** The layout's problems as "field: message" lines; empty when it can be sent for processing. */
export function layoutProblems(layout: CaptureLayout, count: number): string[] {
	const parsed = captureLayoutSchema.safeParse(layout);
	const problems = parsed.success
		? []
		: parsed.error.issues.map((i) => `${i.path.join('.') || 'layout'}: ${i.message}`);
	const used = [
		layout.timeColumn,
		layout.idColumn,
		layout.extendedColumn,
		layout.dlcColumn,
		layout.dataColumn,
		...layout.byteColumns
	];
	for (const c of used)
		if (c !== null && count > 0 && c >= count)
			problems.push(`column ${c + 1} is not in the file (it has ${count})`);
	const single = [
		layout.timeColumn,
		layout.idColumn,
		layout.extendedColumn,
		layout.dlcColumn,
		layout.dataColumn
	].filter((c) => c !== null);
	if (new Set(single).size !== single.length)
		problems.push('two fields are read from the same column');
	return problems;
}

/** Switches between one hex data column and separate byte columns (consecutive from `first`). */
export function withDataColumns(
	layout: CaptureLayout,
	mode: 'single' | 'bytes',
	first: number,
	byteCount = 8
): CaptureLayout {
	if (mode === 'single') return { ...layout, dataColumn: first, byteColumns: [] };
	return {
		...layout,
		dataColumn: null,
		byteColumns: Array.from({ length: byteCount }, (_, k) => first + k)
	};
}
