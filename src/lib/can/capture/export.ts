/**
 * Capture exports as CSV, produced as a generator of text chunks so a capture of millions of
 * samples never becomes one giant string: decoded channels in long form (one row per sample) or
 * wide form (one column per channel, resampled on a fixed interval), and the raw frames in the
 * canonical capture layout of docs/capture-csv.md, which the importer reads back unchanged.
 * Values are written with the decimals their signal's scale allows (`src/lib/value-format.ts`:
 * exact, without binary noise such as 99.80000000000001), means with 12 significant digits, times
 * with `String(n)`; names are written by `csvText` (src/lib/can/csv-cell.ts): quoted per RFC 4180
 * when needed, neutralised when a spreadsheet would run them as formulas.
 */
import { csvText } from '../csv-cell';
import { lengthToDlc } from '../dlc';
import type { Channel } from './channels';
import { upperBound } from './decimate';
import type { FrameColumns } from './frame-columns';
import { FLAG_EXTENDED } from './frame-store';
import { CANONICAL_HEADER } from './layout';
import { slugPart } from '../../slug';
import { formatComputed, valueFormatter } from '../../value-format';

/** What an export needs of a channel (a decoded `Channel` fits). Times must be non-decreasing. */
export type ExportChannel = Pick<Channel, 'info' | 'time' | 'value'>;

/** Characters gathered before a chunk is handed out: large enough to amortise, small enough to stream. */
export const CHUNK_CHARS = 1 << 16;

/** Collects rows and hands them out in chunks of about CHUNK_CHARS. */
export function* chunked(rows: Iterable<string>): Generator<string> {
	let buffer = '';
	for (const row of rows) {
		buffer += row;
		if (buffer.length >= CHUNK_CHARS) {
			yield buffer;
			buffer = '';
		}
	}
	if (buffer) yield buffer;
}

export const LONG_FORM_HEADER = 'time,frame,signal,value,unit';

/**
 * One row per sample, `time,frame,signal,value,unit`, in time order across all channels (a k-way
 * merge over a binary heap); samples at the same time keep the channels' order (the map's order).
 */
export function* longFormCsv(
	channels: readonly ExportChannel[],
	options: { header?: boolean } = {}
): Generator<string> {
	const middle = channels.map(
		(c) => `,${csvText(c.info.frameName)},${csvText(c.info.signalName)},`
	);
	const tail = channels.map((c) => `,${csvText(c.info.unit)}\n`);
	const format = channels.map((c) => valueFormatter(c.info.precision));
	const next = new Uint32Array(channels.length); // each channel's next sample
	// Heap of channel indices ordered by (next sample's time, channel index).
	const heap: number[] = [];
	const before = (a: number, b: number) => {
		const ta = channels[a].time[next[a]];
		const tb = channels[b].time[next[b]];
		return ta < tb || (ta === tb && a < b);
	};
	const siftDown = (at: number) => {
		for (;;) {
			const l = 2 * at + 1;
			const r = l + 1;
			let top = at;
			if (l < heap.length && before(heap[l], heap[top])) top = l;
			if (r < heap.length && before(heap[r], heap[top])) top = r;
			if (top === at) return;
			[heap[at], heap[top]] = [heap[top], heap[at]];
			at = top;
		}
	};
	channels.forEach((c, k) => {
		if (c.time.length > 0) heap.push(k);
	});
	for (let at = (heap.length >> 1) - 1; at >= 0; at--) siftDown(at);

	function* rows(): Generator<string> {
		if (options.header ?? true) yield LONG_FORM_HEADER + '\n';
		while (heap.length > 0) {
			const k = heap[0];
			const c = channels[k];
			const i = next[k]++;
			yield String(c.time[i]) + middle[k] + format[k](c.value[i]) + tail[k];
			if (next[k] === c.time.length) {
				const last = heap.pop()!;
				if (heap.length > 0) heap[0] = last;
			}
			siftDown(0);
		}
	}
	yield* chunked(rows());
}

export type ResampleMode = 'last' | 'mean';

export interface WideFormOptions {
	/** Seconds between rows; rows sit at start + k·interval. */
	interval: number;
	/**
	 * `last`: each cell is the channel's latest sample at or before the row's time (held until the
	 * next sample; empty before the first). `mean`: the mean of the channel's samples in
	 * (time − interval, time], empty when there are none. Both use only samples up to the row's time.
	 */
	mode: ResampleMode;
	/** First row's time; the earliest sample of any channel when absent. */
	from?: number;
	/** No row after this time; the latest sample of any channel when absent. */
	to?: number;
}

/** Rows a wide export may have, so a tiny interval over a long capture is refused rather than run for hours. */
export const MAX_WIDE_ROWS = 10_000_000;

/** Rows of a wide export over [from, to]; a RangeError (with the advice) beyond MAX_WIDE_ROWS. */
export function wideRowCount(from: number, to: number, interval: number): number {
	if (!(interval > 0) || !Number.isFinite(interval)) {
		throw new RangeError(
			`the resampling interval must be a positive number of seconds, got ${interval}`
		);
	}
	// A tiny tolerance so a span that is a whole number of intervals keeps its last row despite rounding.
	const rowCount = Math.floor((to - from) / interval + 1e-9) + 1;
	if (rowCount > MAX_WIDE_ROWS) {
		throw new RangeError(
			`an interval of ${interval} s over ${to - from} s makes ${rowCount} rows, more than ${MAX_WIDE_ROWS}; choose a longer interval`
		);
	}
	return rowCount;
}

/** The wide-form column name of a channel: `<frame>.<signal> [unit]`, CSV-quoted when needed. */
export function wideColumnName(info: ExportChannel['info']): string {
	return csvText(`${info.frameName}.${info.signalName}${info.unit ? ` [${info.unit}]` : ''}`);
}

/** One column per channel, resampled on a fixed interval (see WideFormOptions for the two modes). */
export function* wideFormCsv(
	channels: readonly ExportChannel[],
	options: WideFormOptions
): Generator<string> {
	const { interval, mode } = options;
	if (!(interval > 0) || !Number.isFinite(interval)) {
		throw new RangeError(
			`the resampling interval must be a positive number of seconds, got ${interval}`
		);
	}
	const withSamples = channels.filter((c) => c.time.length > 0);
	const from = options.from ?? Math.min(...withSamples.map((c) => c.time[0]));
	const to = options.to ?? Math.max(...withSamples.map((c) => c.time[c.time.length - 1]));
	const header = ['time', ...channels.map((c) => wideColumnName(c.info))].join(',') + '\n';
	const format = channels.map((c) => valueFormatter(c.info.precision));
	if (!Number.isFinite(from) || !Number.isFinite(to) || to < from) {
		yield header; // no samples (or an empty range): the header alone
		return;
	}
	const rowCount = wideRowCount(from, to, interval);

	function* rows(): Generator<string> {
		yield header;
		let previousTick = -Infinity;
		for (let k = 0; k < rowCount; k++) {
			// 15 significant digits drop the binary noise of k·interval (0.1·3 = 0.30000000000000004);
			// the rounded tick is both the one compared and the one written, so the row stays exact.
			const tick = Number((from + k * interval).toPrecision(15));
			let row = String(tick);
			for (const [k, c] of channels.entries()) {
				row += ',';
				if (mode === 'last') {
					const i = upperBound(c.time, tick) - 1;
					if (i >= 0) row += format[k](c.value[i]);
				} else {
					// Samples in (previous tick, tick]: consecutive rows share their boundary, so each sample counts once.
					const start = upperBound(c.time, k === 0 ? tick - interval : previousTick);
					const end = upperBound(c.time, tick);
					let sum = 0;
					for (let i = start; i < end; i++) sum += c.value[i];
					if (end > start) row += formatComputed(sum / (end - start));
				}
			}
			previousTick = tick;
			yield row + '\n';
		}
	}
	yield* chunked(rows());
}

const HEX_BYTE = Array.from({ length: 256 }, (_, b) =>
	b.toString(16).toUpperCase().padStart(2, '0')
);

/**
 * The raw frames in the canonical layout `time,id,extended,dlc,data`: time in seconds from the
 * first frame, the ID in hex (3 digits standard, 8 extended), the ISO 11898-1 DLC code (CAN FD
 * lengths 12–64 bytes as codes 9–15) and the payload as spaced hex bytes.
 */
export function* canonicalCaptureCsv(
	store: FrameColumns,
	options: { header?: boolean } = {}
): Generator<string> {
	const { time, id, flags, length, dataOffset, data } = store;
	function* rows(): Generator<string> {
		if (options.header ?? true) yield CANONICAL_HEADER + '\n';
		for (let i = 0; i < store.count; i++) {
			const extended = (flags[i] & FLAG_EXTENDED) !== 0;
			let bytes = '';
			for (let b = dataOffset[i], end = b + length[i]; b < end; b++)
				bytes += (bytes ? ' ' : '') + HEX_BYTE[data[b]];
			const idHex = id[i]
				.toString(16)
				.toUpperCase()
				.padStart(extended ? 8 : 3, '0');
			yield `${String(time[i])},${idHex},${extended ? 1 : 0},${lengthToDlc(length[i])},${bytes}\n`;
		}
	}
	yield* chunked(rows());
}

/** A chunk generator as a web stream of UTF-8 bytes, pulled one chunk at a time (for a download Response). */
export function csvByteStream(chunks: Iterable<string>): ReadableStream<Uint8Array> {
	const iterator = chunks[Symbol.iterator]();
	const encoder = new TextEncoder();
	return new ReadableStream<Uint8Array>({
		pull(controller) {
			const { done, value } = iterator.next();
			if (done) controller.close();
			else controller.enqueue(encoder.encode(value));
		},
		cancel() {
			iterator.return?.();
		}
	});
}

export type CaptureExportKind = 'long' | 'wide' | 'frames';

/** A file-name-safe part: letters, digits and dashes only (names may hold any character). */
function fileNamePart(name: string): string {
	return slugPart(name, 'capture');
}

/**
 * `lap-3.long.engine-map-r2.csv`: CSV has no comment lines, so the map and revision a decoded
 * export was made with travel in its file name. The raw frames need no map: `lap-3.frames.csv`.
 */
export function captureExportFileName(
	captureName: string,
	kind: CaptureExportKind,
	decodedWith?: { mapName: string; revision: string }
): string {
	if (kind !== 'frames' && !decodedWith)
		throw new Error(`a ${kind}-form export must name the map and revision it was decoded with`);
	const map =
		kind === 'frames' || !decodedWith
			? ''
			: `.${fileNamePart(decodedWith.mapName)}-${fileNamePart(decodedWith.revision)}`;
	return `${fileNamePart(captureName)}.${kind}${map}.csv`;
}
