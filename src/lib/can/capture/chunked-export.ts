/**
 * The capture exports of export.ts produced from the chunked store one segment at a time, so an
 * export of any size holds one segment's channels in memory: raw frames in the canonical layout,
 * decoded channels in long form (merged in time order within each segment) and in wide form
 * (resampled by a streaming resampler that carries each channel's state across segments).
 * Segments follow each other in time in a capture whose times never go back; then the output is
 * byte for byte what export.ts gives for the whole capture (the tests compare them). A capture
 * with backward times (kept in file order, reported at import) is exported segment by segment.
 */
import { formatComputed, valueFormatter } from '../../value-format';
import type { ChannelInfo, CompiledMap } from '../decoder';
import type { ChunkSource } from './chunked-decode';
import { decodedSegments } from './chunked-decode';
import { CANONICAL_HEADER } from './layout';
import {
	canonicalCaptureCsv,
	CHUNK_CHARS,
	LONG_FORM_HEADER,
	longFormCsv,
	wideColumnName,
	wideRowCount,
	type ResampleMode
} from './export';

/** Canonical CSV of every frame, segment by segment. */
export async function* framesCsvChunked(source: ChunkSource): AsyncGenerator<string> {
	let first = true;
	for await (const { columns } of decodedSegments(source, null)) {
		yield* canonicalCaptureCsv(columns, { header: first });
		first = false;
	}
	if (first) yield CANONICAL_HEADER + '\n';
}

/** Long form, segment by segment. */
export async function* longFormCsvChunked(
	source: ChunkSource,
	compiled: CompiledMap
): AsyncGenerator<string> {
	let first = true;
	for await (const { channels } of decodedSegments(source, compiled)) {
		yield* longFormCsv(channels, { header: first });
		first = false;
	}
	if (first) yield LONG_FORM_HEADER + '\n';
}

export interface WideChunkedOptions {
	interval: number;
	mode: ResampleMode;
	/** Per channel, the time of its first and last sample (null without samples): fixes the rows up front. */
	channelTimes: readonly { firstTime: number | null; lastTime: number | null }[];
}

/**
 * The row count of a wide export, checked before anything is produced (RangeError beyond the
 * limit), and null when no channel has samples (the header alone).
 */
export function wideRows(
	options: WideChunkedOptions
): { from: number; to: number; rowCount: number } | null {
	let from = Infinity;
	let to = -Infinity;
	for (const c of options.channelTimes) {
		if (c.firstTime !== null && c.firstTime < from) from = c.firstTime;
		if (c.lastTime !== null && c.lastTime > to) to = c.lastTime;
	}
	if (!Number.isFinite(from) || !Number.isFinite(to) || to < from) {
		wideRowCount(0, 0, options.interval); // still refuses a bad interval
		return null;
	}
	return { from, to, rowCount: wideRowCount(from, to, options.interval) };
}

/** Wide form, segment by segment (see WideFormOptions in export.ts for the two modes). */
export async function* wideFormCsvChunked(
	source: ChunkSource,
	compiled: CompiledMap,
	options: WideChunkedOptions
): AsyncGenerator<string> {
	const infos: ChannelInfo[] = compiled.channels;
	const header = ['time', ...infos.map((info) => wideColumnName(info))].join(',') + '\n';
	const plan = wideRows(options);
	if (!plan) {
		yield header;
		return;
	}
	const { from, rowCount } = plan;
	const { interval, mode } = options;
	const n = infos.length;
	// Values printed as the whole-capture export prints them (src/lib/value-format.ts).
	const format = infos.map((info) => valueFormatter(info.precision));
	// Each channel's samples not yet used up (time > the last row written), and its held value.
	let time: Float64Array[] = infos.map(() => new Float64Array(0));
	let value: Float64Array[] = infos.map(() => new Float64Array(0));
	const held = new Float64Array(n);
	const holding = new Uint8Array(n);
	let k = 0;
	let previousTick = -Infinity;
	let buffer = header;

	/** Rows whose tick is before `until` (every sample at or before them has arrived). */
	function* rowsBefore(until: number): Generator<string> {
		const cursor = new Uint32Array(n);
		for (; k < rowCount; k++) {
			// The same tick export.ts writes (15 significant digits, see there).
			const tick = Number((from + k * interval).toPrecision(15));
			if (!(tick < until)) break;
			let row = String(tick);
			for (let c = 0; c < n; c++) {
				row += ',';
				const t = time[c];
				const v = value[c];
				let i = cursor[c];
				if (mode === 'last') {
					while (i < t.length && t[i] <= tick) {
						held[c] = v[i++];
						holding[c] = 1;
					}
					if (holding[c]) row += format[c](held[c]);
				} else {
					const lower = k === 0 ? tick - interval : previousTick;
					while (i < t.length && t[i] <= lower) i++;
					let sum = 0;
					let count = 0;
					while (i < t.length && t[i] <= tick) {
						sum += v[i++];
						count++;
					}
					if (count > 0) row += formatComputed(sum / count);
				}
				cursor[c] = i;
			}
			previousTick = tick;
			buffer += row + '\n';
			if (buffer.length >= CHUNK_CHARS) {
				yield buffer;
				buffer = '';
			}
		}
		for (let c = 0; c < n; c++) {
			time[c] = time[c].subarray(cursor[c]);
			value[c] = value[c].subarray(cursor[c]);
		}
	}

	const index = source.index;
	for await (const { segment, channels } of decodedSegments(source, compiled)) {
		time = channels.map((c, i) => join(time[i], c.time.subarray(0, c.count)));
		value = channels.map((c, i) => join(value[i], c.value.subarray(0, c.count)));
		// Later segments hold no sample before this one's latest frame (times never going back).
		yield* rowsBefore(index.segmentMaxTime[segment]);
	}
	yield* rowsBefore(Infinity);
	if (buffer) yield buffer;
}

function join(a: Float64Array, b: Float64Array): Float64Array {
	if (a.length === 0) return b;
	if (b.length === 0) return a;
	const out = new Float64Array(a.length + b.length);
	out.set(a);
	out.set(b, a.length);
	return out;
}
