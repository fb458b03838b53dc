/**
 * The capture's clock for every view of the capture page (docs/capture-csv.md, "Wall-clock times"):
 * the page provides the capture's origin once; tables, plot axes, the cursor readout and span
 * headers read times as the recording's clock showed them. Relative seconds stay the unit of every
 * request and of the URL.
 */
import { getContext, setContext } from 'svelte';
import {
	formatClock,
	hasClock,
	type CaptureOrigin,
	type ClockOptions
} from '$lib/can/capture/clock';
import { formatSeconds } from '$lib/format';

const KEY = Symbol('capture-clock');
const RELATIVE: CaptureOrigin = { kind: 'relative', seconds: 0 };

export interface CaptureClock {
	/** Whether times can be shown as clock readings. */
	readonly absolute: boolean;
	/** Frame time `t` as the clock read it (null for relative captures). */
	clock(t: number, options?: ClockOptions): string | null;
	/** `12.5 s`, with the clock reading beside it when there is one: `12.5 s (14:03:19.750)`. */
	at(t: number): string;
}

export function clockFor(origin: CaptureOrigin): CaptureClock {
	return {
		absolute: hasClock(origin),
		clock: (t, options) => formatClock(origin, t, options),
		at: (t) => {
			const reading = formatClock(origin, t, { timeOnly: origin.kind !== 'time-of-day' });
			return reading === null ? `${formatSeconds(t)} s` : `${formatSeconds(t)} s (${reading})`;
		}
	};
}

/** Called by the page with a getter, so components follow a change of capture data. */
export function provideClock(origin: () => CaptureOrigin | undefined): void {
	setContext(KEY, origin);
}

/** The page's clock; relative seconds outside a capture page. */
export function useClock(): CaptureClock {
	const get = getContext<(() => CaptureOrigin | undefined) | undefined>(KEY);
	return {
		get absolute() {
			return hasClock(get?.() ?? RELATIVE);
		},
		clock: (t, options) => clockFor(get?.() ?? RELATIVE).clock(t, options),
		at: (t) => clockFor(get?.() ?? RELATIVE).at(t)
	};
}
