/**
 * Measured bus load of a capture over time: each frame's exact bus bits (its own stuff bits and the
 * intermission, via frameBusBitsAt) summed per time window by captureBusLoad. CAN FD frames switch bit
 * rate mid-frame and are not modelled there, so they are counted and left out.
 */
import { captureBusLoad, frameBusBitsAt } from '../busload';
import { FLAG_EXTENDED, FLAG_FD, type FrameStore } from './frame-store';

export interface LoadOverTime {
	bitrate: number;
	windowSeconds: number;
	windows: { start: number; percent: number }[];
	/** Mean load over the whole capture (first to last window). */
	meanPercent: number;
	peakPercent: number;
	/** CAN FD frames left out of the figures. */
	fdFramesSkipped: number;
}

/** Upper bound on windows returned, so a long capture still gives a chart-sized series. */
const MAX_WINDOWS = 10_000;

export function loadOverTime(
	store: FrameStore,
	bitrate: number,
	windowSeconds = 0.1
): LoadOverTime {
	const times = store.time;
	const ids = store.id;
	const flags = store.flags;
	const lengths = store.length;
	const offsets = store.dataOffset;
	const pool = store.data;
	// A classical frame takes at most 160 bus bits (Davis et al. 2007 bound, extended, 8 bytes).
	const bits = new Uint16Array(store.count);
	let fdFramesSkipped = 0;
	let first = Infinity;
	let last = -Infinity;
	for (let i = 0; i < store.count; i++) {
		if (times[i] < first) first = times[i];
		if (times[i] > last) last = times[i];
		if (flags[i] & FLAG_FD) {
			fdFramesSkipped++;
			continue;
		}
		// Straight from the payload pool: no view per frame.
		bits[i] = frameBusBitsAt(
			ids[i],
			(flags[i] & FLAG_EXTENDED) !== 0,
			pool,
			offsets[i],
			lengths[i]
		);
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
		windowSeconds: window,
		windows,
		meanPercent: windows.length ? total / windows.length : 0,
		peakPercent,
		fdFramesSkipped
	};
}
