import { describe, expect, it } from 'vitest';
import { formatJsonPath } from '../map-json';
import {
	alertRuleSchema,
	DEFAULT_ALERT_MESSAGE,
	formatAlertMessage,
	SEVERITY_LABELS
} from './rule';

// Invented demo rules.
const valid = {
	id: 'oil-low',
	name: 'Oil pressure low',
	channel: { frame: 'EngineStatus', signal: 'OilPressure' },
	condition: 'below',
	setpoint: 150,
	severity: 'critical'
};

/** Every problem as `path: message`, the way an editor would show it. */
function problems(input: unknown): string[] {
	const parsed = alertRuleSchema.safeParse(input);
	return parsed.success
		? []
		: parsed.error.issues.map((i) => `${formatJsonPath(i.path)}: ${i.message}`);
}

describe('alertRuleSchema', () => {
	it('fills defaults: no deadband, no delays, not latching, the default message', () => {
		expect(alertRuleSchema.parse(valid)).toEqual({
			...valid,
			deadband: 0,
			onDelayS: 0,
			offDelayS: 0,
			latching: false,
			message: DEFAULT_ALERT_MESSAGE
		});
	});

	it('takes a band with low and high for "outside"', () => {
		const { setpoint: _, ...rest } = valid;
		expect(
			alertRuleSchema.parse({ ...rest, condition: 'outside', low: 11, high: 15 })
		).toMatchObject({ low: 11, high: 15 });
		expect(problems({ ...rest, condition: 'outside', low: 11 })).toEqual([
			'high: band high must be a finite number'
		]);
	});

	it.each([
		[{ deadband: -1 }, 'deadband: deadband must be 0 or more (in the signal unit)'],
		[{ onDelayS: -0.5 }, 'onDelayS: on-delay must be 0 or more seconds'],
		[{ offDelayS: 90_000 }, 'offDelayS: off-delay must be at most 86400 s (one day)'],
		[{ setpoint: Number.POSITIVE_INFINITY }, 'setpoint: setpoint must be a finite number'],
		[{ severity: 'warning' }, 'severity: Invalid option: expected one of "advisory"|"critical"'],
		[{ condition: 'between' }, 'condition: condition must be "above", "below" or "outside"'],
		[
			{ channel: { frame: 'EngineStatus', signal: ' ' } },
			'channel.signal: name the signal the rule watches'
		],
		[{ name: '' }, 'name: a rule needs a name'],
		[
			{ message: 'Oil {pressure} low' },
			'message: unknown placeholder "{pressure}"; use {value}, {unit}, {setpoint}, {name}'
		],
		[
			{ message: 'Oil {value low' },
			'message: a "{" or "}" is not part of a placeholder; placeholders look like {value}, {unit}, {setpoint}, {name}'
		],
		[{ colour: 'red' }, ': Unrecognized key: "colour"']
	])('rejects %j with a message naming the field', (change, expected) => {
		expect(problems({ ...valid, ...change })).toEqual([expected]);
	});
});

describe('formatAlertMessage', () => {
	const rule = alertRuleSchema.parse({
		...valid,
		message: '{name}: {value} {unit} (limit {setpoint} {unit})'
	});

	it('fills every placeholder', () => {
		expect(formatAlertMessage(rule, 132.5, 'kPa')).toBe(
			'Oil pressure low: 132.5 kPa (limit 150 kPa)'
		);
	});

	it('rounds long decimals to 6 significant digits and shows an absent value as n/a', () => {
		expect(formatAlertMessage(rule, 1 / 3, 'kPa')).toBe(
			'Oil pressure low: 0.333333 kPa (limit 150 kPa)'
		);
		expect(formatAlertMessage(rule, NaN, 'kPa')).toBe('Oil pressure low: n/a kPa (limit 150 kPa)');
	});

	it("shows the limit on the value's side of a band, and drops the space of an empty unit", () => {
		const { setpoint: _, ...rest } = valid;
		const band = alertRuleSchema.parse({
			...rest,
			name: 'Supply voltage',
			condition: 'outside',
			low: 11,
			high: 15,
			message: '{name} {value}{unit} past {setpoint}{unit}'
		});
		expect(formatAlertMessage(band, 15.4, 'V')).toBe('Supply voltage 15.4V past 15V');
		expect(formatAlertMessage(band, 10.9, 'V')).toBe('Supply voltage 10.9V past 11V');
		expect(formatAlertMessage(band, 12, 'V')).toBe('Supply voltage 12V past 11…15V');
		expect(formatAlertMessage(alertRuleSchema.parse(valid), 140, '')).toBe('Oil pressure low: 140');
	});

	it('labels severities for display', () => {
		expect(Object.values(SEVERITY_LABELS)).toEqual(['Advisory', 'Critical']);
	});
});
