/**
 * Streaming import of a capture CSV. Text arrives in chunks (a string, a web ReadableStream or any
 * async iterable — a Node file stream is one), is cut at whole lines and handed to papaparse's
 * parser one chunk at a time, so memory holds one chunk of text plus the compact frames, never the
 * whole file. Bad rows are reported by line number and skipped; good rows always survive.
 * Plain lines of the common layouts skip papaparse's field strings (canonical-line.ts); every other
 * line, and every bad row, goes through papaparse and the row parser.
 * Line numbers assume one row per line (CAN captures have no quoted line breaks).
 */
import Papa from 'papaparse';
import { linePlan, readPlainLine, type LinePlan } from './canonical-line';
import { CaptureFormatError, detectCaptureLayout, SAMPLE_ROWS } from './detect-layout';
import { FrameStore, type FrameSink } from './frame-store';
import { captureLayoutSchema, secondsPerTimeUnit, type CaptureLayout } from './layout';
import {
	createParsedRow,
	createRowParser,
	createRowParserState,
	ROW_KIND,
	type ParsedRow,
	type RowParserState
} from './row-parser';

export type CaptureChunk = string | Uint8Array;
export type CaptureSource =
	string | ReadableStream<CaptureChunk> | AsyncIterable<CaptureChunk> | Iterable<CaptureChunk>;

export interface BadRow {
	/** 1-based line number in the file. */
	line: number;
	reason: string;
}

export interface IngestReport {
	layout: CaptureLayout;
	/** How the layout was guessed; empty when the caller gave the layout. */
	layoutNotes: string[];
	frameCount: number;
	lineCount: number;
	/** The first MAX_REPORTED_BAD_ROWS bad rows; `badRowCount` counts them all. */
	badRows: BadRow[];
	badRowCount: number;
	/** Rows whose time is earlier than the row before (kept, in file order). */
	backwardsTimeCount: number;
	firstBackwardsLine: number | null;
	/** Time of the first frame in seconds as written (epoch seconds for wall-clock times); null if none. */
	timeOrigin: number | null;
	/** Remote requests and error frames written as rows: counted and listed, never bad rows. */
	remoteFrameCount: number;
	errorFrameCount: number;
	/** The first MAX_REPORTED_BAD_ROWS of them, by line. */
	specialRows: { line: number; kind: 'remote' | 'error' }[];
	/** Bus names in order of first appearance (empty without a bus column); frames hold the index. */
	buses: string[];
	/** Tag texts in order of first appearance; a frame's tag is index + 1 (0 = none). */
	tags: string[];
	/** How often a time-of-day column passed midnight. */
	midnightCrossings: number;
	warnings: string[];
}

export interface IngestOptions {
	/** A confirmed or corrected layout; guessed from the first rows when absent. */
	layout?: CaptureLayout;
	/**
	 * Read plain lines in place (default true; canonical-line.ts). false sends every line through
	 * papaparse; the results are the same either way (tests and the benchmark compare the two routes).
	 */
	canonicalFastPath?: boolean;
}

export const MAX_REPORTED_BAD_ROWS = 1000;

/**
 * Clock times are read as seconds of the day or since 1970, so the difference of two readings carries
 * the subtraction's rounding (12:00:00.340 − 12:00:00.250 gives 0.0899999999965, not 0.09). Relative
 * times are rounded to the finest step the reading can hold: 1 ns for a time of day (a float64 of up to
 * a few days in seconds resolves about 10⁻¹¹ s), 1 µs for a date-time (since 1970 it resolves about
 * 2.4 × 10⁻⁷ s). Numeric times are kept as read.
 */
const CLOCK_STEPS_PER_SECOND: Record<CaptureLayout['timeFormat'], number> = {
	number: 0,
	'time-of-day': 1e9,
	'date-time': 1e6
};

/** Characters of text parsed at a time: large enough to amortise calls, small enough to stay bounded. */
const PARSE_CHUNK_CHARS = 1 << 20;
/**
 * A decoded chunk at least this long is read where it lies (only the line it shares with the chunk
 * before is joined): appending it to the carried-over text would copy it once more, and the large
 * strings left behind cost full garbage collections.
 */
const IN_PLACE_CHARS = 1 << 14;
/** Text read before guessing the layout (unless SAMPLE_ROWS lines arrive first). */
const SAMPLE_CHARS = 1 << 18;

function isReadableStream(source: unknown): source is ReadableStream<CaptureChunk> {
	return typeof (source as ReadableStream | null)?.getReader === 'function';
}

/** Decodes any supported source into text chunks (UTF-8, split multi-byte characters handled). */
async function* textChunks(source: CaptureSource): AsyncGenerator<string> {
	if (typeof source === 'string') {
		for (let at = 0; at < source.length; at += PARSE_CHUNK_CHARS)
			yield source.slice(at, at + PARSE_CHUNK_CHARS);
		return;
	}
	const decoder = new TextDecoder('utf-8');
	const text = (chunk: CaptureChunk) =>
		typeof chunk === 'string' ? chunk : decoder.decode(chunk, { stream: true });
	if (isReadableStream(source)) {
		const reader = source.getReader();
		try {
			for (;;) {
				const { done, value } = await reader.read();
				if (done) break;
				yield text(value);
			}
		} finally {
			reader.releaseLock();
		}
	} else {
		for await (const chunk of source) yield text(chunk);
	}
	const tail = decoder.decode();
	if (tail) yield tail;
}

function detectNewline(text: string): '\n' | '\r\n' | '\r' {
	const lf = text.indexOf('\n');
	if (lf > 0 && text.charCodeAt(lf - 1) === 13) return '\r\n';
	if (lf >= 0) return '\n';
	return text.includes('\r') ? '\r' : '\n';
}

function countLines(text: string, limit: number): number {
	let n = 0;
	for (let at = text.indexOf('\n'); at >= 0 && n < limit; at = text.indexOf('\n', at + 1)) n++;
	return n;
}

/** A layout the user corrected by hand, checked with the one schema; problems name the field. */
function checkLayout(layout: unknown): CaptureLayout {
	const parsed = captureLayoutSchema.safeParse(layout);
	if (parsed.success) return parsed.data;
	const problems = parsed.error.issues.map((i) => `${i.path.join('.') || 'layout'}: ${i.message}`);
	throw new CaptureFormatError(`The column layout is not valid: ${problems.join('; ')}.`);
}

/** Streams a capture into `sink` (e.g. a FrameStore, or a decoder that writes rows out). */
export async function ingestCaptureInto(
	source: CaptureSource,
	sink: FrameSink,
	options: IngestOptions = {}
): Promise<IngestReport> {
	let layout: CaptureLayout | null = options.layout ? checkLayout(options.layout) : null;
	const layoutNotes: string[] = [];
	let newline: '\n' | '\r\n' | '\r' = '\n';
	let parser: Papa.Parser | null = null;
	let parseRow: ReturnType<typeof createRowParser> = () => null;
	const parserState: RowParserState = createRowParserState();
	let remoteFrameCount = 0;
	let errorFrameCount = 0;
	const specialRows: IngestReport['specialRows'] = [];
	let secondsPerUnit = 1;
	let clockSteps = 0;
	let plan: LinePlan | null = null;

	const out = createParsedRow();
	const fastOut = createParsedRow();
	const badRows: BadRow[] = [];
	let badRowCount = 0;
	let line = 0;
	let headerPending = false;
	let frameCount = 0;
	let firstTime: number | null = null;
	let previousTime = -Infinity;
	let backwardsTimeCount = 0;
	let firstBackwardsLine: number | null = null;

	const start = (sample: string, final: boolean) => {
		newline = detectNewline(sample);
		if (!layout) {
			const complete = final ? sample : sample.slice(0, sample.lastIndexOf(newline));
			const guess = detectCaptureLayout(complete);
			if (guess.problem) throw new CaptureFormatError(guess.problem);
			layout = guess.layout;
			layoutNotes.push(...guess.notes);
		}
		parser = new Papa.Parser({ delimiter: layout.delimiter, newline });
		parseRow = createRowParser(layout, parserState);
		plan = (options.canonicalFastPath ?? true) ? linePlan(layout, parserState) : null;
		secondsPerUnit = secondsPerTimeUnit(layout);
		clockSteps = CLOCK_STEPS_PER_SECOND[layout.timeFormat];
		headerPending = layout.hasHeader;
	};

	/** A row read into `out`: make its time relative and hand it to the sink. */
	const acceptRow = (row: ParsedRow) => {
		if (row.kind !== ROW_KIND.data) {
			if (row.kind === ROW_KIND.remote) remoteFrameCount++;
			else errorFrameCount++;
			if (specialRows.length < MAX_REPORTED_BAD_ROWS)
				specialRows.push({ line, kind: row.kind === ROW_KIND.remote ? 'remote' : 'error' });
			return;
		}
		firstTime ??= row.time;
		if (row.time < previousTime) {
			backwardsTimeCount++;
			firstBackwardsLine ??= line;
		}
		previousTime = row.time;
		// Subtract in the file's unit first so epoch times keep their sub-millisecond digits.
		// No extras object for a frame that has none: sinks take their absence as the defaults.
		const extras =
			row.bus === 0 && row.direction === 0 && row.tag === 0
				? undefined
				: { bus: row.bus, direction: row.direction, tag: row.tag };
		const relative = (row.time - firstTime) * secondsPerUnit;
		sink.add(
			clockSteps === 0 ? relative : Math.round(relative * clockSteps) / clockSteps,
			row.id,
			row.extended,
			row.data,
			row.length,
			extras
		);
		frameCount++;
	};

	/** The general route: papaparse splits the text, the row parser reads the fields. */
	const consumeParsed = (text: string, dropLastRow: boolean) => {
		const rows: string[][] = parser!.parse(text, 0, dropLastRow).data;
		for (const row of rows) {
			line++;
			if (row.length === 1 && row[0].trim() === '') continue;
			if (headerPending) {
				headerPending = false;
				continue;
			}
			const problem = parseRow(row, out);
			if (problem !== null) {
				if (badRows.length < MAX_REPORTED_BAD_ROWS) badRows.push({ line, reason: problem });
				badRowCount++;
				continue;
			}
			acceptRow(out);
		}
	};

	/**
	 * Whole lines of text[from, to) (the last one may lack its newline when `dropLastRow` is false).
	 * Plain lines are read in place; runs of other lines go the general route in file order.
	 * Text with a quote always goes the general route, since a quoted field may span lines.
	 */
	const consume = (text: string, dropLastRow: boolean, from = 0, to = text.length) => {
		const quote = text.indexOf('"', from);
		if (plan === null || (quote >= 0 && quote < to))
			return consumeParsed(text.slice(from, to), dropLastRow);
		const step = newline.length;
		let at = from;
		// The header (the first non-blank row) goes the general route, which skips it.
		while (headerPending && at < to) {
			let end = text.indexOf(newline, at);
			if (end >= to) end = -1;
			const next = end < 0 ? to : end + step;
			consumeParsed(text.slice(at, next), end >= 0 || dropLastRow);
			at = next;
		}
		let slowFrom = -1; // start of a run of lines for the general route
		while (at < to) {
			let end = text.indexOf(newline, at);
			if (end < 0 || end > to) end = to;
			if (readPlainLine(text, at, end, fastOut, plan)) {
				// Its own row buffer: the earlier lines of the general route are handled first and reuse `out`.
				if (slowFrom >= 0) consumeParsed(text.slice(slowFrom, at), true);
				slowFrom = -1;
				line++;
				acceptRow(fastOut);
			} else if (slowFrom < 0) slowFrom = at;
			at = end + step;
		}
		if (slowFrom >= 0) consumeParsed(text.slice(slowFrom, to), dropLastRow);
	};

	let pending = '';
	let first = true;
	for await (let text of textChunks(source)) {
		if (first && text.length > 0) {
			text = text.replace(/^\ufeff/, ''); // a byte-order mark is not part of the first field
			first = false;
		}
		if (parser && text.length >= IN_PLACE_CHARS) {
			const head = text.indexOf(newline);
			const cut = text.lastIndexOf(newline);
			if (head >= 0) {
				const step = newline.length;
				// the line begun in the chunk before, joined to its end (a CR LF split between the chunks included)
				consume(pending + text.slice(0, head + step), true);
				consume(text, true, head + step, cut + step);
				pending = text.slice(cut + step);
				continue;
			}
		}
		pending += text;
		if (!parser) {
			if (pending.length < SAMPLE_CHARS && countLines(pending, SAMPLE_ROWS + 2) < SAMPLE_ROWS + 2)
				continue;
			start(pending, false);
		}
		if (pending.length < PARSE_CHUNK_CHARS) continue;
		const cut = pending.lastIndexOf(newline);
		if (cut < 0) continue;
		consume(pending.slice(0, cut + newline.length), true);
		pending = pending.slice(cut + newline.length);
	}
	if (!parser) {
		if (pending.trim() === '' && !layout) {
			throw new CaptureFormatError('The capture is empty: it has no rows to read.');
		}
		start(pending, true);
	}
	if (pending.length > 0) consume(pending, pending.endsWith(newline));

	const finalLayout = layout as unknown as CaptureLayout;
	const warnings: string[] = [];
	if (frameCount === 0) {
		warnings.push(
			badRowCount > 0
				? 'No row could be read as a frame.'
				: 'The capture has no frames (header only or empty).'
		);
	}
	if (badRowCount > 0) {
		warnings.push(
			`${badRowCount} row(s) could not be read and were skipped; the first is line ${badRows[0].line}: ${badRows[0].reason}.`
		);
	}
	if (remoteFrameCount + errorFrameCount > 0) {
		warnings.push(
			`${remoteFrameCount} remote request(s) and ${errorFrameCount} error frame(s) are listed apart from the data frames (first at line ${specialRows[0].line}).`
		);
	}
	if (parserState.midnightCrossings > 0) {
		warnings.push(
			`The time of day passes midnight ${parserState.midnightCrossings} time(s); later times count on from 24:00.`
		);
	}
	if (backwardsTimeCount > 0) {
		warnings.push(
			`${backwardsTimeCount} row(s) have a time earlier than the row before (first at line ${firstBackwardsLine}); they are kept in file order.`
		);
	}
	return {
		layout: finalLayout,
		layoutNotes,
		frameCount,
		lineCount: line,
		badRows,
		badRowCount,
		backwardsTimeCount,
		firstBackwardsLine,
		timeOrigin: firstTime === null ? null : firstTime * secondsPerUnit,
		remoteFrameCount,
		errorFrameCount,
		specialRows,
		buses: parserState.buses,
		tags: parserState.tags,
		midnightCrossings: parserState.midnightCrossings,
		warnings
	};
}

/** Streams a capture into a new FrameStore. */
export async function ingestCapture(
	source: CaptureSource,
	options: IngestOptions = {}
): Promise<IngestReport & { store: FrameStore }> {
	const store = new FrameStore();
	const report = await ingestCaptureInto(source, store, options);
	store.origin = {
		timeOrigin: report.timeOrigin ?? 0,
		epoch: report.layout.epochTime || report.layout.timeFormat === 'date-time'
	};
	return { ...report, store };
}
