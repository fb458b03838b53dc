/**
 * Measured bus load of a capture over time: each frame's exact bus time summed per time window by
 * captureBusLoad. Classical frames count their bits with their own stuff bits and the intermission
 * (frameBusBitsAt); CAN FD frames (payloads over 8 bytes, FLAG_FD) their arbitration phase at the
 * nominal bit rate and their data phase at the data bit rate (fd-frame-bits.ts), in nominal bit
 * times. A capture file does not say whether an FD frame switched bit rate (BRS): given a data bit
 * rate, every FD frame is taken to switch; without one, none does (all at the nominal rate).
 * See docs/can-fd-and-transport.md.
 */
import { captureBusLoad, checkBitrates, frameBusBitsAt, nominalBitTimes } from '../busload';
import { fdPhaseBitsAt } from '../fd-frame-bits';
import { FLAG_EXTENDED, FLAG_FD, type FrameStore } from './frame-store';

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
	store: FrameStore,
	bitrate: number,
	windowSeconds = 0.1,
	dataBitrate?: number
): LoadOverTime {
	const bitRateSwitch = dataBitrate !== undefined;
	const dataRate = dataBitrate ?? bitrate;
	checkBitrates(bitrate, dataRate);
	const fdOptions = { bitRateSwitch };
	const times = store.time;
	const ids = store.id;
	const flags = store.flags;
	const lengths = store.length;
	const offsets = store.dataOffset;
	const pool = store.data;
	// Bus time per frame in nominal bit times (fractional for FD frames whose data phase is faster).
	const bits = new Float64Array(store.count);
	let fdFrames = 0;
	let first = Infinity;
	let last = -Infinity;
	for (let i = 0; i < store.count; i++) {
		if (times[i] < first) first = times[i];
		if (times[i] > last) last = times[i];
		const extended = (flags[i] & FLAG_EXTENDED) !== 0;
		// Straight from the payload pool: no view per frame.
		if (flags[i] & FLAG_FD) {
			fdFrames++;
			const phases = fdPhaseBitsAt(ids[i], extended, pool, offsets[i], lengths[i], fdOptions);
			bits[i] = nominalBitTimes(phases, bitrate, dataRate);
		} else {
			bits[i] = frameBusBitsAt(ids[i], extended, pool, offsets[i], lengths[i]);
		}
	}
	const span = store.count ? last - first : 0;
	const window = Math.max(windowSeconds, span / MAX_WINDOWS);
	const windows = captureBusLoad(times, bits, bitrate, window);
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
}
