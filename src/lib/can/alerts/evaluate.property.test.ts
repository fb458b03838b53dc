import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { evaluateAlertRule } from './evaluate';
import { alertRuleSchema, excursion, isBeyond, type AlertRule } from './rule';

// Properties of the replay over random irregular signals with absent (NaN) samples. The brute-force
// checks below scan every sample directly from the definitions in evaluate.ts, independently of its
// state machine and binary searches. Each failing case reproduces from its seed.

type Random = ReturnType<typeof seededRandom>;

function randomRule(rnd: Random, overrides: Partial<Record<string, unknown>> = {}): AlertRule {
	const condition = rnd.pick(['above', 'below', 'outside'] as const);
	const low = rnd.int(20, 50);
	const limits =
		condition === 'outside' ? { low, high: low + rnd.int(5, 40) } : { setpoint: rnd.int(30, 70) };
	const maybe = (hi: number) => (rnd.next() < 0.4 ? 0 : rnd.next() * hi);
	return alertRuleSchema.parse({
		id: 'p',
		name: 'Property',
		channel: { frame: 'F', signal: 'S' },
		severity: rnd.pick(['advisory', 'critical'] as const),
		condition,
		...limits,
		deadband: maybe(8),
		onDelayS: maybe(3),
		offDelayS: maybe(3),
		latching: rnd.next() < 0.5,
		...overrides
	});
}

/** A random walk on irregular times (sometimes repeated), about 10 % of samples absent. */
function randomChannel(rnd: Random) {
	const n = rnd.int(0, 80);
	const time = new Float64Array(n);
	const value = new Float64Array(n);
	let t = rnd.next() * 5;
	let v = rnd.next() * 100;
	for (let i = 0; i < n; i++) {
		t += rnd.next() < 0.1 ? 0 : rnd.next() * 2;
		v = Math.min(100, Math.max(0, v + (rnd.next() - 0.5) * 30));
		time[i] = t;
		value[i] = rnd.next() < 0.1 ? NaN : v;
	}
	return { time, value };
}

/** Brute force: the most extreme held value over [from, to) — or [from, to] when closed. */
function heldExtreme(
	rule: AlertRule,
	time: Float64Array,
	value: Float64Array,
	from: number,
	to: number,
	closed: boolean
): number {
	const candidates: number[] = [];
	let held = NaN;
	time.forEach((t, i) => {
		if (t <= from && !Number.isNaN(value[i])) held = value[i];
	});
	if (!Number.isNaN(held)) candidates.push(held);
	time.forEach((t, i) => {
		if (t > from && (closed ? t <= to : t < to) && !Number.isNaN(value[i]))
			candidates.push(value[i]);
	});
	return candidates.reduce((best, v) => (excursion(rule, v) > excursion(rule, best) ? v : best));
}

const SEEDS = Array.from({ length: 400 }, (_, i) => i + 1);

describe('evaluateAlertRule properties (random signals)', () => {
	it.each(SEEDS)(
		'seed %i: events never overlap, each peak is the extreme held value of its span and beyond the setpoint',
		(seed) => {
			const rnd = seededRandom(seed);
			const rule = randomRule(rnd);
			const { time, value } = randomChannel(rnd);
			const last = time.length ? time[time.length - 1] : 0;
			const endTime = rnd.next() < 0.5 ? undefined : last + (rnd.next() - 0.3) * 4;
			const acknowledgements = Array.from({ length: rnd.int(0, 4) }, () => rnd.next() * (last + 2));
			const { events, transitions } = evaluateAlertRule(rule, time, value, {
				endTime,
				acknowledgements
			});
			const end = endTime ?? (time.length ? last : -Infinity);

			events.forEach((event, i) => {
				if (i > 0) {
					const previous = events[i - 1];
					expect(previous.end, `event ${i - 1} must have ended before event ${i}`).not.toBeNull();
					expect(event.start).toBeGreaterThanOrEqual(previous.end!);
				}
				expect(event.start).toBeLessThanOrEqual(event.end ?? end);
				expect(event.duration).toBeCloseTo((event.end ?? end) - event.start, 9);
				expect(event.peak).toBe(
					heldExtreme(rule, time, value, event.start, event.end ?? end, event.end === null)
				);
				expect(isBeyond(rule, event.peak), `peak ${event.peak} must be beyond the setpoint`).toBe(
					true
				);
				if (event.latched) expect(rule.latching).toBe(true);
			});

			// The transitions form one chain from normal, in time order; each event begins with a move out of normal.
			transitions.forEach((move, i) => {
				expect(move.from).toBe(i === 0 ? 'normal' : transitions[i - 1].to);
				if (i > 0) expect(move.time).toBeGreaterThanOrEqual(transitions[i - 1].time);
				if (!rule.latching) expect(move.to).not.toBe('rtnUnacknowledged');
			});
			expect(transitions.filter((move) => move.from === 'normal').length).toBe(events.length);
		}
	);

	it.each(SEEDS.slice(0, 200))(
		'seed %i: without delays, latching or acknowledgements, matches a plain hysteresis loop',
		(seed) => {
			const rnd = seededRandom(seed);
			const rule = randomRule(rnd, { onDelayS: 0, offDelayS: 0, latching: false });
			const { time, value } = randomChannel(rnd);

			// Reference: active from the first sample beyond the setpoint to the first sample back past the
			// deadband, over the held values: present samples only, the last one of each time stamp.
			const held = new Map<number, number>();
			time.forEach((t, i) => {
				if (!Number.isNaN(value[i])) held.set(t, value[i]);
			});
			const expected: [number, number | null][] = [];
			let active = false;
			held.forEach((v, t) => {
				const back =
					rule.condition === 'above'
						? v < rule.setpoint - rule.deadband
						: rule.condition === 'below'
							? v > rule.setpoint + rule.deadband
							: v > rule.low + rule.deadband && v < rule.high - rule.deadband;
				if (!active && isBeyond(rule, v)) {
					active = true;
					expected.push([t, null]);
				} else if (active && back) {
					active = false;
					expected[expected.length - 1][1] = t;
				}
			});
			const { events } = evaluateAlertRule(rule, time, value);
			expect(events.map((e) => [e.start, e.end])).toEqual(expected);
		}
	);
});
