/**
 * Decodes every frame of a capture that the map defines into channels: one time series per signal,
 * holding only the samples where the signal was present, with summary statistics.
 */
import { SIGNAL_STATUS, type ChannelInfo, type CompiledMap } from '../decoder';
import type { FrameStore } from './frame-store';
import { GrowableFloat64 } from './growable';

export interface Channel {
	info: ChannelInfo;
	/** Seconds from the capture's first frame, one per present sample. */
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

interface Accumulator {
	time: GrowableFloat64;
	value: GrowableFloat64;
	min: number;
	max: number;
	sum: number;
	last: number;
	outOfRange: number;
	notAvailable: number;
	error: number;
}

export function decodeChannels(store: FrameStore, compiled: CompiledMap): Channel[] {
	const acc: Accumulator[] = compiled.channels.map(() => ({
		time: new GrowableFloat64(),
		value: new GrowableFloat64(),
		min: Infinity,
		max: -Infinity,
		sum: 0,
		last: NaN,
		outOfRange: 0,
		notAvailable: 0,
		error: 0
	}));
	const lo = compiled.channels.map((c) => c.min ?? -Infinity);
	const hi = compiled.channels.map((c) => c.max ?? Infinity);
	const out = new Float64Array(Math.max(1, compiled.channels.length));
	const status = new Uint8Array(out.length);
	const { time, id, flags, length, dataOffset, data } = store;

	for (let i = 0; i < store.count; i++) {
		const frame = compiled.lookup(id[i], (flags[i] & 1) !== 0);
		if (frame === undefined) continue;
		const start = frame.channelStart;
		frame.decode(data, dataOffset[i], length[i], out, start, status);
		for (let c = start; c < start + frame.channelCount; c++) {
			const v = out[c];
			const a = acc[c];
			if (v === v) {
				a.time.push(time[i]);
				a.value.push(v);
				if (v < a.min) a.min = v;
				if (v > a.max) a.max = v;
				a.sum += v;
				a.last = v;
				if (v < lo[c] || v > hi[c]) a.outOfRange++;
			} else if (status[c] === SIGNAL_STATUS.notAvailable) a.notAvailable++;
			else if (status[c] === SIGNAL_STATUS.error) a.error++;
		}
	}

	return compiled.channels.map((info, c) => {
		const a = acc[c];
		const count = a.value.count;
		return {
			info,
			time: a.time.toArray(),
			value: a.value.toArray(),
			count,
			min: count ? a.min : null,
			max: count ? a.max : null,
			mean: count ? a.sum / count : null,
			last: count ? a.last : null,
			outOfRangeCount: a.outOfRange,
			notAvailableCount: a.notAvailable,
			errorCount: a.error
		};
	});
}
