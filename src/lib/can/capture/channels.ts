/**
 * Decodes every frame of a capture that the map defines into channels: one time series per signal,
 * holding only the samples where the signal was present, with summary statistics.
 */
import { SIGNAL_STATUS, type ChannelInfo, type CompiledMap } from '../decoder';
import { FLAG_EXTENDED, type FrameStore } from './frame-store';


export interface Channel {
	info: ChannelInfo;
	/**
	 * Seconds from the capture's first frame, one per present sample. Read-only: signals of one frame
	 * that are present in every received frame share one array.
	 */
	time: Float64Array;
	/** Physical values (raw × scale + offset). */
	value: Float64Array;
	count: number;
	/** null when the channel has no samples. */
	min: number | null;
	max: number | null;
	mean: number | null;
	last: number | null;
	/** Samples below the signal's min or above its max (when the map gives them). */
	outOfRangeCount: number;
	/** Samples the sender flagged as "not available" / "error" (SAE J1939-71 ranges, J1939 frames). */
	notAvailableCount: number;
	errorCount: number;
}

interface ColumnSummary {
	count: number;
	min: number;
	max: number;
	sum: number;
	last: number;
	outOfRange: number;
	notAvailable: number;
	error: number;
}

/** Statistics of column k of a row-major table (`width` values a row, `rows` rows). */
function summariseColumn(table: Float64Array, status: Uint8Array, rows: number, width: number, k: number, lo: number, hi: number): ColumnSummary {
	const s: ColumnSummary = { count: 0, min: Infinity, max: -Infinity, sum: 0, last: NaN, outOfRange: 0, notAvailable: 0, error: 0 };
	for (let j = 0, at = k; j < rows; j++, at += width) {
		const v = table[at];
		if (v === v) {
			s.count++;
			if (v < s.min) s.min = v;
			if (v > s.max) s.max = v;
			s.sum += v;
			s.last = v;
			if (v < lo || v > hi) s.outOfRange++;
		} else if (status[at] === SIGNAL_STATUS.notAvailable) s.notAvailable++;
		else if (status[at] === SIGNAL_STATUS.error) s.error++;
	}
	return s;
}

/**
 * Three steps, so nothing ever grows or is copied twice:
 *  1. resolve each received frame's definition once and count frames per definition;
 *  2. decode every frame into its definition's row-major table (one row per received frame, one
 *     column per signal): each decode writes one contiguous row, and one time array per definition;
 *  3. per signal, read its column into exactly sized arrays and compute the statistics, then drop the
 *     table. A signal present in every frame of its definition shares that definition's time array.
 */
export function decodeChannels(store: FrameStore, compiled: CompiledMap): Channel[] {
	const { time, id, flags, length, dataOffset, data } = store;
	const n = store.count;
	const { frames } = compiled;
	const frameOf = new Int32Array(n);
	const rows = new Uint32Array(frames.length);
	for (let i = 0; i < n; i++) {
		const f = compiled.indexOf(id[i], (flags[i] & FLAG_EXTENDED) !== 0);
		frameOf[i] = f;
		if (f >= 0) rows[f]++;
	}

	const width = Uint32Array.from(frames, (frame) => frame.channelCount);
	const frameTime = frames.map((_, f) => new Float64Array(rows[f]));
	const table: (Float64Array | null)[] = frames.map((_, f) => new Float64Array(rows[f] * width[f]));
	const tableStatus: (Uint8Array | null)[] = frames.map((_, f) => new Uint8Array(rows[f] * width[f]));
	const row = new Uint32Array(frames.length);
	for (let i = 0; i < n; i++) {
		const f = frameOf[i];
		if (f < 0) continue;
		const j = row[f]++;
		frameTime[f][j] = time[i];
		compiled.decodeAt(f, data, dataOffset[i], length[i], table[f]!, j * width[f], tableStatus[f]!);
	}

	const channels: Channel[] = [];
	frames.forEach((frame, f) => {
		const values = table[f]!;
		const status = tableStatus[f]!;
		for (let k = 0; k < frame.channelCount; k++) {
			const info = compiled.channels[frame.channelStart + k];
			const s = summariseColumn(values, status, rows[f], width[f], k, info.min ?? -Infinity, info.max ?? Infinity);
			const value = new Float64Array(s.count);
			let channelTime = frameTime[f];
			if (s.count < rows[f]) {
				// Absent in some frames (other mux page, short payload): keep only the present samples.
				channelTime = new Float64Array(s.count);
				for (let j = 0, at = k, m = 0; j < rows[f]; j++, at += width[f]) {
					const v = values[at];
					if (v === v) {
						channelTime[m] = frameTime[f][j];
						value[m++] = v;
					}
				}
			} else {
				for (let j = 0, at = k; j < rows[f]; j++, at += width[f]) value[j] = values[at];
			}
			channels.push({
				info,
				time: channelTime,
				value,
				count: s.count,
				min: s.count ? s.min : null,
				max: s.count ? s.max : null,
				mean: s.count ? s.sum / s.count : null,
				last: s.count ? s.last : null,
				outOfRangeCount: s.outOfRange,
				notAvailableCount: s.notAvailable,
				errorCount: s.error
			});
		}
		table[f] = null; // this definition's table is read: let it go before the next one's columns
		tableStatus[f] = null;
	});
	return channels;
}
