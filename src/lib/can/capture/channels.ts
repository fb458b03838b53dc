/**
 * Decodes every frame of a capture that the map defines into channels: one time series per signal,
 * holding only the samples where the signal was present, with summary statistics.
 */
import { SIGNAL_STATUS, type ChannelInfo, type CompiledMap } from '../decoder';
import type { FrameColumns } from './frame-columns';
import { FLAG_EXTENDED } from './frame-store';

export interface Channel {
	info: ChannelInfo;
	/**
	 * Seconds from the capture's first frame, one per present sample. Read-only: signals of one frame
	 * that are present in every received frame share one array.
	 */
	time: Float64Array;
	/** Physical values (raw × scale + offset); may be a view into a buffer shared with sibling channels. */
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

/** Statistics of one decoded column (NaN = absent or flagged); `status` only for J1939 frames. */
function summarise(
	values: Float64Array,
	status: Uint8Array | null,
	lo: number,
	hi: number
): ColumnSummary {
	const s: ColumnSummary = {
		count: 0,
		min: Infinity,
		max: -Infinity,
		sum: 0,
		last: NaN,
		outOfRange: 0,
		notAvailable: 0,
		error: 0
	};
	for (let j = 0; j < values.length; j++) {
		const v = values[j];
		if (v === v) {
			s.count++;
			if (v < s.min) s.min = v;
			if (v > s.max) s.max = v;
			s.sum += v;
			s.last = v;
			if (v < lo || v > hi) s.outOfRange++;
		} else if (status?.[j] === SIGNAL_STATUS.notAvailable) s.notAvailable++;
		else if (status?.[j] === SIGNAL_STATUS.error) s.error++;
	}
	return s;
}

/**
 * Three steps, so nothing grows and a signal present in every frame is never copied:
 *  1. resolve each received frame's definition once and count frames per definition;
 *  2. decode every frame straight into its definition's column-major table (one column per signal,
 *     one row per received frame; the decoder writes with stride = rows) and one time array;
 *  3. per signal: a column without gaps becomes the channel as it is (a view of the table) and
 *     shares the definition's time array; a column with gaps (mux pages, short payloads) is
 *     compacted into arrays of its own.
 */
export function decodeChannels(store: FrameColumns, compiled: CompiledMap): Channel[] {
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

	const frameTime = frames.map((_, f) => new Float64Array(rows[f]));
	const table = frames.map((frame, f) => new Float64Array(rows[f] * frame.channelCount));
	// Statuses tell "not available" from "error" from absent; only J1939 frames can flag values.
	const tableStatus = frames.map((frame, f) =>
		frame.frame.j1939 ? new Uint8Array(rows[f] * frame.channelCount) : undefined
	);
	const row = new Uint32Array(frames.length);
	for (let i = 0; i < n; i++) {
		const f = frameOf[i];
		if (f < 0) continue;
		const j = row[f]++;
		frameTime[f][j] = time[i];
		compiled.decodeAt(f, data, dataOffset[i], length[i], table[f], j, tableStatus[f], rows[f]);
	}

	const channels: Channel[] = [];
	frames.forEach((frame, f) => {
		const m = rows[f];
		for (let k = 0; k < frame.channelCount; k++) {
			const info = compiled.channels[frame.channelStart + k];
			const column = table[f].subarray(k * m, (k + 1) * m);
			const status = tableStatus[f]?.subarray(k * m, (k + 1) * m) ?? null;
			const s = summarise(column, status, info.min ?? -Infinity, info.max ?? Infinity);
			let value = column;
			let channelTime = frameTime[f];
			if (s.count < m) {
				value = new Float64Array(s.count);
				channelTime = new Float64Array(s.count);
				for (let j = 0, at = 0; j < m; j++) {
					const v = column[j];
					if (v === v) {
						channelTime[at] = frameTime[f][j];
						value[at++] = v;
					}
				}
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
	});
	return channels;
}
