/**
 * Replays one alert rule over a channel (irregularly sampled time series) and lists its events and
 * alarm-state transitions.
 *
 * State names follow the alarm state model of ISA-18.2 / IEC 62682 (from memory): normal, active
 * unacknowledged, active acknowledged, returned to normal unacknowledged. As this product specifies,
 * only a latching rule waits in "returned unacknowledged" (counted as still active) until someone
 * acknowledges it; a non-latching rule goes straight back to normal when the value returns.
 *
 * Timing model: each sample's value holds until the next sample (sample-and-hold); NaN samples are
 * absent and change nothing; of samples sharing a time stamp the last present one is the value held
 * (the others were held for no time at all). The on-delay runs from the first sample beyond the setpoint and the
 * alert activates once the condition has held that long; a sample that breaks the condition at that
 * very instant wins. The off-delay works the same way for the return condition (back past the
 * setpoint by more than the deadband).
 */
import { z } from 'zod';
import { alertSeveritySchema, excursion, isBeyond, isReturned, type AlertRule } from './rule';

export type AlarmState = 'normal' | 'unacknowledged' | 'acknowledged' | 'rtnUnacknowledged';

export interface AlarmTransition {
	time: number;
	from: AlarmState;
	to: AlarmState;
}

export const alertEventSchema = z.object({
	/** The rule's id. */
	rule: z.string(),
	severity: alertSeveritySchema,
	/** When the alert activated (after the on-delay). */
	start: z.number(),
	/** When it went back to normal; null = still active (or latched, unacknowledged) at the end. */
	end: z.number().nullable(),
	/**
	 * The most extreme value (in the alerting direction) the channel held during [start, end), or
	 * [start, end of recording] for an event still active at the end.
	 */
	peak: z.number(),
	/** Seconds from start to end (or to the end of the recording). */
	duration: z.number(),
	/** Whether the value returned while the alert was unacknowledged, so the latch held it. */
	latched: z.boolean(),
	acknowledgedAt: z.number().nullable(),
	/** When the value last returned (after the off-delay) during this event. */
	returnedAt: z.number().nullable()
});
export type AlertEvent = z.infer<typeof alertEventSchema>;

export interface AlertEvaluation {
	events: AlertEvent[];
	transitions: AlarmTransition[];
}

export interface EvaluateOptions {
	/** Times someone acknowledged the alert (in any order); times after the end are ignored. */
	acknowledgements?: readonly number[];
	/** End of the recording; defaults to the last sample time. Samples after it are ignored. */
	endTime?: number;
}

function checkSeries(time: Float64Array, value: Float64Array): void {
	if (time.length !== value.length) {
		throw new RangeError(
			`time and value must have the same length (got ${time.length} times and ${value.length} values)`
		);
	}
	for (let i = 0; i < time.length; i++) {
		if (!Number.isFinite(time[i]))
			throw new RangeError(`sample ${i}: time ${time[i]} is not a finite number`);
		if (i > 0 && time[i] < time[i - 1]) {
			throw new RangeError(
				`sample ${i}: time ${time[i]} is earlier than the previous sample (${time[i - 1]}); samples must be in time order`
			);
		}
	}
}

/** Whether a later present sample has the same time as sample `i` (and so replaces its value). */
function supersededAtSameTime(time: Float64Array, value: Float64Array, i: number): boolean {
	for (let j = i + 1; j < time.length && time[j] === time[i]; j++)
		if (value[j] === value[j]) return true;
	return false;
}

/** Index of the first sample with time > t (or ≥ t when `inclusive` is false), by binary search. */
function firstAfter(time: Float64Array, t: number, inclusive: boolean): number {
	let lo = 0;
	let hi = time.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (inclusive ? time[mid] <= t : time[mid] < t) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

/** The held value with the largest excursion over [start, end) — or [start, end] when `closedEnd`. */
function peakWithin(
	rule: AlertRule,
	time: Float64Array,
	value: Float64Array,
	start: number,
	end: number,
	closedEnd: boolean
): number {
	let peak = NaN;
	let best = -Infinity;
	const consider = (v: number) => {
		if (v === v && excursion(rule, v) > best) {
			best = excursion(rule, v);
			peak = v;
		}
	};
	// The value held at `start` is the last present sample at or before it.
	for (let i = firstAfter(time, start, true) - 1; i >= 0; i--) {
		if (value[i] === value[i]) {
			consider(value[i]);
			break;
		}
	}
	const stop = firstAfter(time, end, closedEnd);
	for (let i = firstAfter(time, start, true); i < stop; i++) consider(value[i]);
	return peak;
}

/** Replays `rule` over the channel `time`/`value` (seconds, physical values; NaN = absent). */
export function evaluateAlertRule(
	rule: AlertRule,
	time: Float64Array,
	value: Float64Array,
	opts: EvaluateOptions = {}
): AlertEvaluation {
	checkSeries(time, value);
	const endTime = opts.endTime ?? (time.length > 0 ? time[time.length - 1] : -Infinity);
	if (Number.isNaN(endTime)) throw new RangeError('endTime must be a number');
	const acks = [...(opts.acknowledgements ?? [])].filter((t) => t <= endTime).sort((a, b) => a - b);
	if (acks.some((t) => !Number.isFinite(t)))
		throw new RangeError('acknowledgement times must be finite numbers');

	const events: AlertEvent[] = [];
	const transitions: AlarmTransition[] = [];
	let state: AlarmState = 'normal';
	let current: AlertEvent | null = null;
	/** The process condition after delays: is the value (still) beyond the setpoint? */
	let processActive = false;
	/** Since when the activation (or, while active, the return) condition has held; null = not holding. */
	let holdingSince: number | null = null;

	const move = (t: number, to: AlarmState) => {
		transitions.push({ time: t, from: state, to });
		state = to;
	};
	const close = (t: number) => {
		current!.end = t;
		current = null;
	};

	const activate = (t: number) => {
		processActive = true;
		if (state === 'normal') {
			current = {
				rule: rule.id,
				severity: rule.severity,
				start: t,
				end: null,
				peak: NaN,
				duration: 0,
				latched: false,
				acknowledgedAt: null,
				returnedAt: null
			};
			events.push(current);
		} else current!.returnedAt = null; // re-alarm while latched: the same event goes on
		move(t, 'unacknowledged');
	};
	const deactivate = (t: number) => {
		processActive = false;
		current!.returnedAt = t;
		if (state === 'unacknowledged' && rule.latching) {
			current!.latched = true;
			move(t, 'rtnUnacknowledged');
		} else {
			move(t, 'normal');
			close(t);
		}
	};
	const acknowledge = (t: number) => {
		if (state === 'unacknowledged') {
			current!.acknowledgedAt = t;
			move(t, 'acknowledged');
		} else if (state === 'rtnUnacknowledged') {
			current!.acknowledgedAt = t;
			move(t, 'normal');
			close(t);
		}
	};
	/** Fires the running delay if it has expired before `t` (or at `t` when `inclusive`). */
	const fireDelay = (t: number, inclusive: boolean) => {
		if (holdingSince === null) return;
		const due = holdingSince + (processActive ? rule.offDelayS : rule.onDelayS);
		if (due < t || (inclusive && due <= t)) {
			holdingSince = null;
			if (processActive) deactivate(due);
			else activate(due);
		}
	};

	let a = 0;
	for (let i = 0; i < time.length && time[i] <= endTime; i++) {
		const t = time[i];
		const v = value[i];
		if (v !== v || supersededAtSameTime(time, value, i)) continue;
		while (a < acks.length && acks[a] < t) {
			fireDelay(acks[a], true);
			acknowledge(acks[a++]);
		}
		fireDelay(t, false);
		// While normal we watch for the activation condition, while active for the return condition.
		const holds = processActive ? isReturned(rule, v) : isBeyond(rule, v);
		if (!holds) holdingSince = null;
		else if (holdingSince === null) holdingSince = t;
		fireDelay(t, true);
		while (a < acks.length && acks[a] === t) acknowledge(acks[a++]);
	}
	while (a < acks.length) {
		fireDelay(acks[a], true);
		acknowledge(acks[a++]);
	}
	fireDelay(endTime, true);

	for (const event of events) {
		const closedAt = event.end ?? endTime;
		event.duration = closedAt - event.start;
		event.peak = peakWithin(rule, time, value, event.start, closedAt, event.end === null);
	}
	return { events, transitions };
}
