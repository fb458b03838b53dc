import { describe, expect, it } from 'vitest';
import { evaluateAlertRule } from './evaluate';
import { alertRuleSchema, type AlertRuleInput } from './rule';

// Alarm states and their transitions follow ISA-18.2 / IEC 62682 (from memory): normal → active
// unacknowledged → (acknowledge) active acknowledged → (return) normal; a latched alarm that returns
// unacknowledged waits in "returned to normal, unacknowledged" until acknowledged. Deadband and
// on/off-delays are the standard's nuisance-alarm remedies. All data below is invented.

const base = {
	id: 'r1',
	name: 'Coolant hot',
	channel: { frame: 'Engine', signal: 'Coolant' },
	severity: 'advisory'
} as const;

function rule(overrides: Partial<AlertRuleInput> & Record<string, unknown> = {}) {
	const condition = overrides.condition === 'outside' ? {} : { condition: 'above', setpoint: 100 };
	return alertRuleSchema.parse({ ...base, ...condition, ...overrides });
}

/** Channel from [time, value] pairs. */
function channel(samples: [number, number][]) {
	return {
		time: Float64Array.from(samples, ([t]) => t),
		value: Float64Array.from(samples, ([, v]) => v)
	};
}

/** One sample a second from t = 0. */
function everySecond(values: number[]) {
	return channel(values.map((v, i) => [i, v]));
}

function run(
	r: ReturnType<typeof rule>,
	samples: { time: Float64Array; value: Float64Array },
	opts = {}
) {
	return evaluateAlertRule(r, samples.time, samples.value, opts);
}

describe('deadband (ISA-18.2 / IEC 62682 hysteresis, from memory)', () => {
	// A noisy coolant temperature that wanders across the 100 °C setpoint, then cools off.
	const noisy = everySecond([95, 101, 99, 102, 98.5, 101.5, 99.5, 100.5, 98, 96, 94]);

	it('without deadband, every crossing back below the setpoint makes a new event (chatter)', () => {
		const { events } = run(rule({ deadband: 0 }), noisy);
		expect(events.map((e) => [e.start, e.end])).toEqual([
			[1, 2],
			[3, 4],
			[5, 6],
			[7, 8]
		]);
	});

	it('a 3 °C deadband gives one event: the value must fall below 97 °C to return', () => {
		const { events, transitions } = run(rule({ deadband: 3 }), noisy);
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({
			start: 1,
			end: 9,
			returnedAt: 9,
			peak: 102,
			duration: 8,
			latched: false
		});
		expect(transitions).toEqual([
			{ time: 1, from: 'normal', to: 'unacknowledged' },
			{ time: 9, from: 'unacknowledged', to: 'normal' }
		]);
	});

	it('mirrors for a below rule: returns only above setpoint + deadband', () => {
		// Oil pressure low alert at 150 kPa with 20 kPa deadband.
		const oil = everySecond([300, 140, 160, 145, 165, 171, 300]);
		const { events } = run(rule({ condition: 'below', setpoint: 150, deadband: 20 }), oil);
		expect(events.map((e) => [e.start, e.end, e.peak])).toEqual([[1, 5, 140]]);
	});

	it('applies on both sides of an outside band', () => {
		// Supply voltage band 11–15 V, 0.5 V deadband: returns only inside 11.5…14.5 V.
		const volts = everySecond([12, 15.2, 14.8, 14.4, 12, 10.8, 11.2, 11.6, 12]);
		const { events } = run(rule({ condition: 'outside', low: 11, high: 15, deadband: 0.5 }), volts);
		expect(events.map((e) => [e.start, e.end, e.peak])).toEqual([
			[1, 3, 15.2],
			[5, 7, 10.8]
		]);
	});
});

describe('on-delay and off-delay (ISA-18.2 / IEC 62682 alarm delays, from memory)', () => {
	it('on-delay ignores a spike shorter than the delay and activates once the condition has held long enough', () => {
		// Spike above 100 for 0.3 s at t = 1, then a sustained excursion from t = 3 on.
		const samples = channel([
			[0, 90],
			[1, 110],
			[1.3, 90],
			[3, 105],
			[3.4, 108],
			[3.8, 104],
			[5, 90],
			[6, 90]
		]);
		const { events } = run(rule({ onDelayS: 1 }), samples);
		// The condition holds from t = 3; the alert activates at 3 + 1 = 4 s (between samples).
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({ start: 4, end: 5, peak: 104, duration: 1 });
	});

	it('a sample that breaks the condition exactly when the on-delay runs out wins', () => {
		const samples = channel([
			[0, 110],
			[1, 90],
			[2, 90]
		]);
		expect(run(rule({ onDelayS: 1 }), samples).events).toEqual([]);
		expect(run(rule({ onDelayS: 0.999 }), samples).events).toHaveLength(1);
	});

	it('off-delay keeps the alert through a short return and ends it once the return has held long enough', () => {
		const samples = everySecond([90, 110, 95, 110, 95, 95, 95, 95]);
		// Returns at t = 2 last only 1 s (< 2 s); the return from t = 4 holds, so the alert ends at 4 + 2 = 6.
		const { events, transitions } = run(rule({ offDelayS: 2 }), samples);
		expect(events.map((e) => [e.start, e.end, e.returnedAt])).toEqual([[1, 6, 6]]);
		expect(transitions.map((t) => t.time)).toEqual([1, 6]);
	});

	it('an alert whose return has not held long enough by the end is still active', () => {
		const { events } = run(rule({ offDelayS: 5 }), everySecond([90, 110, 95, 95]));
		expect(events[0]).toMatchObject({ start: 1, end: null, duration: 2, returnedAt: null });
	});
});

describe('latching and acknowledgement (ISA-18.2 / IEC 62682 state model, from memory)', () => {
	const excursion = everySecond([90, 110, 120, 95, 90, 90, 90]);

	it('a latching rule stays active after return until acknowledged: RTN unacknowledged, then normal', () => {
		const { events, transitions } = run(rule({ latching: true }), excursion, {
			acknowledgements: [5.5]
		});
		expect(transitions).toEqual([
			{ time: 1, from: 'normal', to: 'unacknowledged' },
			{ time: 3, from: 'unacknowledged', to: 'rtnUnacknowledged' },
			{ time: 5.5, from: 'rtnUnacknowledged', to: 'normal' }
		]);
		expect(events).toEqual([
			{
				rule: 'r1',
				severity: 'advisory',
				start: 1,
				end: 5.5,
				peak: 120,
				duration: 4.5,
				latched: true,
				acknowledgedAt: 5.5,
				returnedAt: 3
			}
		]);
	});

	it('a latched, never acknowledged alert is still active at the end of the recording', () => {
		const { events, transitions } = run(rule({ latching: true }), excursion);
		expect(events[0]).toMatchObject({
			start: 1,
			end: null,
			duration: 5,
			latched: true,
			acknowledgedAt: null,
			returnedAt: 3
		});
		expect(transitions.at(-1)).toEqual({
			time: 3,
			from: 'unacknowledged',
			to: 'rtnUnacknowledged'
		});
	});

	it('an acknowledgement while active moves to acknowledged, and the return then goes to normal without latching', () => {
		const { events, transitions } = run(rule({ latching: true }), excursion, {
			acknowledgements: [2, 6]
		});
		expect(transitions).toEqual([
			{ time: 1, from: 'normal', to: 'unacknowledged' },
			{ time: 2, from: 'unacknowledged', to: 'acknowledged' },
			{ time: 3, from: 'acknowledged', to: 'normal' }
		]);
		expect(events[0]).toMatchObject({ end: 3, latched: false, acknowledgedAt: 2 });
	});

	it('a re-alarm while latched continues the same event', () => {
		const { events, transitions } = run(
			rule({ latching: true }),
			everySecond([90, 110, 90, 115, 90, 90]),
			{ acknowledgements: [5] }
		);
		expect(transitions.map((t) => t.to)).toEqual([
			'unacknowledged',
			'rtnUnacknowledged',
			'unacknowledged',
			'rtnUnacknowledged',
			'normal'
		]);
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({ start: 1, end: 5, peak: 115, returnedAt: 4, latched: true });
	});

	it('a non-latching rule clears on return, acknowledged or not', () => {
		const { events, transitions } = run(rule({ latching: false }), excursion);
		expect(transitions).toEqual([
			{ time: 1, from: 'normal', to: 'unacknowledged' },
			{ time: 3, from: 'unacknowledged', to: 'normal' }
		]);
		expect(events[0]).toMatchObject({
			start: 1,
			end: 3,
			latched: false,
			acknowledgedAt: null,
			returnedAt: 3
		});
	});

	it('ignores acknowledgements in normal and after the end of the recording', () => {
		const { transitions } = run(rule({ latching: true }), excursion, {
			acknowledgements: [0.5, 99]
		});
		expect(transitions.map((t) => t.to)).toEqual(['unacknowledged', 'rtnUnacknowledged']);
	});
});

describe('samples and recording end', () => {
	it('NaN (absent) samples hold the previous state', () => {
		const { events } = run(rule(), everySecond([90, 110, NaN, NaN, 95]));
		expect(events.map((e) => [e.start, e.end, e.peak])).toEqual([[1, 4, 110]]);
	});

	it('of samples sharing a time stamp, the last present one is the value held', () => {
		const samples = channel([
			[0, 90],
			[1, 110],
			[1, 95],
			[2, 105],
			[2, NaN],
			[3, 90]
		]);
		expect(run(rule(), samples).events.map((e) => [e.start, e.end, e.peak])).toEqual([[2, 3, 105]]);
	});

	it('endTime extends the recording past the last sample, so a delay can still run out', () => {
		const samples = everySecond([90, 110]);
		expect(run(rule({ onDelayS: 3 }), samples).events).toEqual([]);
		expect(run(rule({ onDelayS: 3 }), samples, { endTime: 10 }).events[0]).toMatchObject({
			start: 4,
			end: null,
			duration: 6,
			peak: 110
		});
	});

	it('ignores samples after endTime', () => {
		const { events } = run(rule(), everySecond([90, 90, 110]), { endTime: 1.5 });
		expect(events).toEqual([]);
	});

	it('rejects series of different lengths and times out of order, naming the sample', () => {
		const r = rule();
		expect(() => evaluateAlertRule(r, new Float64Array(2), new Float64Array(3))).toThrow(
			/same length/
		);
		expect(() =>
			run(
				r,
				channel([
					[0, 1],
					[2, 1],
					[1, 1]
				])
			)
		).toThrow(/sample 2: time 1 is earlier/);
	});

	it('gives nothing for an empty channel', () => {
		expect(run(rule(), channel([]))).toEqual({ events: [], transitions: [] });
	});
});
