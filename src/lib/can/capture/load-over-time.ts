/**
 * Measured bus load of a capture over time: each frame's exact bus time summed per time window, as
 * captureBusLoad (busload.ts) counts them. Classical frames count their bits with their own stuff bits and the intermission
 * (frameBusBitsAt); CAN FD frames (payloads over 8 bytes, FLAG_FD) their arbitration phase at the
 * nominal bit rate and their data phase at the data bit rate (fd-frame-bits.ts), in nominal bit
 * times. A capture file does not say whether an FD frame switched bit rate (BRS): given a data bit
 * rate, every FD frame is taken to switch; without one, none does (all at the nominal rate).
 * See docs/can-fd-and-transport.md.
 */
import { checkBitrates, frameBusBitsAt, nominalBitTimes } from '../busload';
import { fdPhaseBitsAt } from '../fd-frame-bits';
import type { FrameColumns } from './frame-columns';
import { FLAG_EXTENDED, FLAG_FD } from './frame-store';

export interface LoadOverTime {
	/** Nominal (arbitration) bit rate. */
	bitrate: number;
	/** Data-phase bit rate of FD frames: the given one, else `bitrate`. */
	dataBitrate: number;
	/** Whether FD frames were taken to switch bit rate (BRS), i.e. a data bit rate was given. */
	bitRateSwitch: boolean;
	windowSeconds: number;
	windows: { start: number; percent: number }[];
	/** Mean load over the whole capture (first to last window). */
	meanPercent: number;
	peakPercent: number;
	/** CAN FD frames among those counted. */
	fdFrames: number;
}

/** Upper bound on windows returned, so a long capture still gives a chart-sized series. */
const MAX_WINDOWS = 10_000;

export function loadOverTime(
	store: FrameColumns,
	bitrate: number,
	windowSeconds = 0.1,
	dataBitrate?: number
): LoadOverTime {
	let first = Infinity;
	let last = -Infinity;
	for (const t of store.time) {
		if (t < first) first = t;
		if (t > last) last = t;
	}
	const counter = createLoadCounter({ bitrate, windowSeconds, dataBitrate, first, last });
	counter.add(store);
	return counter.finish();
}

/**
 * The same figures fed a capture piece by piece (segments of the chunked store), given the
 * capture's first and last frame time up front (the store's index knows them), so the windows are
 * fixed before the first frame: each frame's bits go to the window of its time, as captureBusLoad
 * counts them.
 */
export function createLoadCounter(options: {
	bitrate: number;
	windowSeconds?: number;
	dataBitrate?: number;
	/** Earliest and latest frame time (first > last for an empty capture). */
	first: number;
	last: number;
}): { add(columns: FrameColumns): void; finish(): LoadOverTime } {
	const { bitrate, first, last, dataBitrate } = options;
	const bitRateSwitch = dataBitrate !== undefined;
	const dataRate = dataBitrate ?? bitrate;
	checkBitrates(bitrate, dataRate);
	const fdOptions = { bitRateSwitch };
	const empty = !(last >= first);
	const span = empty ? 0 : last - first;
	const window = Math.max(options.windowSeconds ?? 0.1, span / MAX_WINDOWS);
	// captureBusLoad's windows: from the earliest time, the last one holding the latest frame.
	const windowBits = new Float64Array(empty ? 0 : Math.floor(span / window) + 1);
	const count = windowBits.length;
	let fdFrames = 0;
	const add = (store: FrameColumns) => {
		const times = store.time;
		const ids = store.id;
		const flags = store.flags;
		const lengths = store.length;
		const offsets = store.dataOffset;
		const pool = store.data;
		for (let i = 0; i < store.count; i++) {
			const extended = (flags[i] & FLAG_EXTENDED) !== 0;
			let bits: number;
			// Straight from the payload pool: no view per frame.
			if (flags[i] & FLAG_FD) {
				fdFrames++;
				const phases = fdPhaseBitsAt(ids[i], extended, pool, offsets[i], lengths[i], fdOptions);
				bits = nominalBitTimes(phases, bitrate, dataRate);
			} else {
				bits = frameBusBitsAt(ids[i], extended, pool, offsets[i], lengths[i]);
			}
			windowBits[Math.min(count - 1, Math.floor((times[i] - first) / window))] += bits;
		}
	};
	const finish = (): LoadOverTime => {
		const capacity = bitrate * window;
		const windows = Array.from(windowBits, (b, k) => ({
			start: first + k * window,
			percent: (100 * b) / capacity
		}));
		let peakPercent = 0;
		let total = 0;
		for (const w of windows) {
			total += w.percent;
			if (w.percent > peakPercent) peakPercent = w.percent;
		}
		return {
			bitrate,
			dataBitrate: dataRate,
			bitRateSwitch,
			windowSeconds: window,
			windows,
			meanPercent: windows.length ? total / windows.length : 0,
			peakPercent,
			fdFrames
		};
	};
	return { add, finish };
}
