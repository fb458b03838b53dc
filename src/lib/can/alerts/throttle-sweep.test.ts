import { describe, expect, it } from 'vitest';
import { evaluateAlertRule } from './evaluate';
import { alertRuleSchema } from './rule';
import { summarizeAlertEvents } from './summary';

// Common practice: a throttle-position Advisory above 50 % that clears as soon as the pedal is back
// below it, and a Critical above 85 % that latches until someone acknowledges it. The sweep and the
// rules are invented demo data; the expected events below are worked out by hand from the sweep.

const channel = { frame: 'PedalAndThrottle', signal: 'ThrottlePosition' };
const advisory = alertRuleSchema.parse({
	id: 'throttle-advisory',
	name: 'Throttle above half',
	channel,
	condition: 'above',
	setpoint: 50,
	severity: 'advisory'
});
const critical = alertRuleSchema.parse({
	id: 'throttle-critical',
	name: 'Throttle wide open',
	channel,
	condition: 'above',
	setpoint: 85,
	severity: 'critical',
	latching: true
});

/**
 * Two pedal sweeps sampled every 0.5 s (t = 0 … 38 s, every value a multiple of 5 %, exact in binary):
 *   0–10 s  rises 0 → 100 % (10 %/s)      10–20 s falls 100 → 0 %
 *   20–29 s rises 0 → 90 %                29–38 s falls 90 → 0 %
 */
function throttleAt(t: number): number {
	if (t <= 10) return 10 * t;
	if (t <= 20) return 200 - 10 * t;
	if (t <= 29) return 10 * (t - 20);
	return 380 - 10 * t;
}
const time = Float64Array.from({ length: 77 }, (_, k) => k / 2);
const value = time.map(throttleAt);

describe('throttle sweep (common practice: advisory above 50 %, latching critical above 85 %)', () => {
	it.each([50, 85, 0, 5, 42.5, 89.9, 90, 95, 99.9])(
		'"above %d", no deadband or delays: events equal a sample-by-sample walk of the ISA-18.2 state model',
		(setpoint) => {
			// Reference written here from the alarm state model of ISA-18.2 / IEC 62682 (from memory),
			// not from evaluate.ts: a sample above the setpoint activates; the first later sample below it
			// returns (a sample equal to the setpoint changes nothing). An acknowledgement while active
			// marks the alarm acknowledged, so its return ends it; a latching alarm that returns
			// unacknowledged waits for the next acknowledgement. Peak: the highest sample while active.
			for (const latching of [false, true]) {
				// Between samples, so no acknowledgement coincides with a return (their order at one instant is
				// a product choice, not part of the state model).
				const acknowledgements = [16.25];
				const rule = alertRuleSchema.parse({ ...advisory, setpoint, latching });
				type Open = { start: number; peak: number; returnedAt: number | null; acked: boolean };
				const expected: object[] = [];
				let open: Open | null = null;
				const close = (event: Open, end: number | null) => {
					const duration = (end ?? time[time.length - 1]) - event.start;
					const latched = latching && event.returnedAt !== null && end !== event.returnedAt;
					const { start, peak, returnedAt } = event;
					expected.push({ start, end, peak, duration, returnedAt, latched });
					open = null;
				};
				let nextAck = 0;
				for (let i = 0; i < time.length; i++) {
					const t = time[i];
					const v = value[i];
					for (; nextAck < acknowledgements.length && acknowledgements[nextAck] <= t; nextAck++) {
						const current = open as Open | null;
						if (!current) continue;
						if (current.returnedAt !== null) close(current, acknowledgements[nextAck]);
						else current.acked = true;
					}
					const current = open as Open | null;
					if (!current) {
						if (v > setpoint) open = { start: t, peak: v, returnedAt: null, acked: false };
						continue;
					}
					if (current.returnedAt !== null) continue; // latched: only an acknowledgement ends it
					current.peak = Math.max(current.peak, v);
					if (v < setpoint) {
						current.returnedAt = t;
						if (!latching || current.acked) close(current, t);
					}
				}
				const last = open as Open | null;
				if (last) close(last, null);

				const { events } = evaluateAlertRule(rule, time, value, { acknowledgements });
				expect(
					events.map(({ start, end, peak, duration, returnedAt, latched }) => ({
						start,
						end,
						peak,
						duration,
						returnedAt,
						latched
					}))
				).toEqual(expected);
			}
		}
	);

	it('Advisory: two events, each from the first sample above 50 % to the first sample below it', () => {
		// Sweep 1: 50 % at t = 5 is not above; 55 % at 5.5 s activates. Falling, 50 % at 15 s holds; 45 % at 15.5 s returns.
		// Sweep 2: 55 % at 25.5 s activates; 50 % at 33 s holds; 45 % at 33.5 s returns. Peaks are the sweep tops.
		const { events } = evaluateAlertRule(advisory, time, value);
		expect(events).toEqual([
			{
				rule: 'throttle-advisory',
				severity: 'advisory',
				start: 5.5,
				end: 15.5,
				peak: 100,
				duration: 10,
				latched: false,
				acknowledgedAt: null,
				returnedAt: 15.5
			},
			{
				rule: 'throttle-advisory',
				severity: 'advisory',
				start: 25.5,
				end: 33.5,
				peak: 90,
				duration: 8,
				latched: false,
				acknowledgedAt: null,
				returnedAt: 33.5
			}
		]);
	});

	it('Critical: latches after each return; the first is acknowledged at 16 s, the second is still latched at the end', () => {
		// Sweep 1: 85 % at 8.5 s is not above, 90 % at 9 s activates; falling, 85 % at 11.5 s holds, 80 % at 12 s
		//          returns → latched (RTN unacknowledged) until the acknowledgement at 16 s → normal. 16 − 9 = 7 s.
		// Sweep 2: 90 % at 29 s activates, 80 % at 30 s returns → latched, never acknowledged: open, 38 − 29 = 9 s.
		const { events, transitions } = evaluateAlertRule(critical, time, value, {
			acknowledgements: [16]
		});
		expect(events).toEqual([
			{
				rule: 'throttle-critical',
				severity: 'critical',
				start: 9,
				end: 16,
				peak: 100,
				duration: 7,
				latched: true,
				acknowledgedAt: 16,
				returnedAt: 12
			},
			{
				rule: 'throttle-critical',
				severity: 'critical',
				start: 29,
				end: null,
				peak: 90,
				duration: 9,
				latched: true,
				acknowledgedAt: null,
				returnedAt: 30
			}
		]);
		expect(transitions).toEqual([
			{ time: 9, from: 'normal', to: 'unacknowledged' },
			{ time: 12, from: 'unacknowledged', to: 'rtnUnacknowledged' },
			{ time: 16, from: 'rtnUnacknowledged', to: 'normal' },
			{ time: 29, from: 'normal', to: 'unacknowledged' },
			{ time: 30, from: 'unacknowledged', to: 'rtnUnacknowledged' }
		]);
	});

	it('summarises per rule: count and total active time (latched time counts as active)', () => {
		const events = [
			...evaluateAlertRule(advisory, time, value).events,
			...evaluateAlertRule(critical, time, value, { acknowledgements: [16] }).events
		];
		expect(summarizeAlertEvents(events)).toEqual([
			{
				rule: 'throttle-advisory',
				severity: 'advisory',
				count: 2,
				totalActiveS: 18,
				latchedCount: 0,
				openCount: 0
			},
			{
				rule: 'throttle-critical',
				severity: 'critical',
				count: 2,
				totalActiveS: 16,
				latchedCount: 2,
				openCount: 1
			}
		]);
	});
});
