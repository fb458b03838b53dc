import { describe, expect, it } from 'vitest';
import { canMapSchema } from '../map';
import { alertRuleSchema, type AlertRuleInput } from './rule';
import { validateAlertRules } from './validate';

// Demo map (invented), except the coolant field, laid out as SAE J1939-71 engine coolant temperature:
// 8 bits, 1 °C/bit, −40 °C offset, so it can carry −40…215 °C.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Club racer engine',
	frames: [
		{
			name: 'EngineStatus',
			id: '0x360',
			cycleMs: 20,
			signals: [
				{
					name: 'ThrottlePosition',
					startBit: 0,
					length: 16,
					scale: 0.1,
					unit: '%',
					min: 0,
					max: 100
				},
				{ name: 'Coolant', startBit: 16, length: 8, offset: -40, unit: '°C' }
			]
		}
	]
});

const rule = (overrides: Partial<AlertRuleInput> & Record<string, unknown>) =>
	alertRuleSchema.parse({
		id: `r-${String(overrides.name ?? 'x')}`,
		name: 'x',
		channel: { frame: 'EngineStatus', signal: 'ThrottlePosition' },
		severity: 'advisory',
		...(overrides.condition === 'outside' ? {} : { condition: 'above', setpoint: 50 }),
		...overrides
	});

describe('validateAlertRules', () => {
	it('finds nothing wrong with sound rules', () => {
		const rules = [
			rule({ name: 'Half throttle' }),
			rule({
				name: 'Coolant band',
				channel: { frame: 'EngineStatus', signal: 'Coolant' },
				condition: 'outside',
				low: 60,
				high: 110,
				deadband: 2
			})
		];
		expect(validateAlertRules(rules, map)).toEqual([]);
	});

	it('reports a rule on a channel the map lacks as an error at the field to fix', () => {
		const rules = [
			rule({ name: 'A' }),
			rule({ name: 'B', channel: { frame: 'EngineStatus', signal: 'OilPressure' } }),
			rule({ name: 'C', channel: { frame: 'Gearbox', signal: 'ThrottlePosition' } })
		];
		expect(
			validateAlertRules(rules, map).map(({ severity, code, path, ruleIndex }) => ({
				severity,
				code,
				path,
				ruleIndex
			}))
		).toEqual([
			{ severity: 'error', code: 'unknown-signal', path: '[1].channel.signal', ruleIndex: 1 },
			{ severity: 'error', code: 'unknown-frame', path: '[2].channel.frame', ruleIndex: 2 }
		]);
	});

	it('warns about a rule on a counter or checksum, whatever its setpoint', () => {
		// Demo map (invented): the throttle frame with a rolling counter and a checksum added.
		const guarded = canMapSchema.parse({
			...map,
			frames: [
				{
					...map.frames[0],
					signals: [
						...map.frames[0].signals,
						{ name: 'Alive', startBit: 24, length: 4, role: 'counter' },
						{ name: 'Crc', startBit: 56, length: 8, role: 'checksum' }
					]
				}
			]
		});
		const rules = [
			rule({ name: 'A' }),
			rule({ name: 'B', channel: { frame: 'EngineStatus', signal: 'Alive' }, setpoint: 99 }),
			rule({ name: 'C', channel: { frame: 'EngineStatus', signal: 'Crc' } })
		];
		const problems = validateAlertRules(rules, guarded);
		expect(problems.map(({ severity, code, path }) => [severity, code, path])).toEqual([
			['warning', 'role-channel', '[1].channel.signal'],
			['warning', 'role-channel', '[2].channel.signal']
		]);
		expect(problems[0].message).toMatch(/"Alive", a counter/);
		expect(problems[1].message).toMatch(/"Crc", a checksum/);
	});

	it('warns about a setpoint outside the signal min/max', () => {
		const [problem] = validateAlertRules([rule({ name: 'Over full', setpoint: 120 })], map);
		expect(problem).toMatchObject({
			severity: 'warning',
			code: 'setpoint-out-of-range',
			path: '[0].setpoint'
		});
		expect(problem.message).toBe(
			'rule "Over full" has setpoint 120 %, outside 0…100 % (its min/max of "ThrottlePosition"), so it may never or always fire'
		);
	});

	it('without min/max, warns about a setpoint the field cannot carry (SAE J1939-71 coolant range −40…215 °C)', () => {
		const coolant = { frame: 'EngineStatus', signal: 'Coolant' };
		expect(
			validateAlertRules([rule({ name: 'Hot', channel: coolant, setpoint: 215 })], map)
		).toEqual([]);
		const problems = validateAlertRules(
			[rule({ name: 'Cold', channel: coolant, condition: 'outside', low: -41, high: 120 })],
			map
		);
		expect(problems.map((p) => [p.code, p.path])).toEqual([['setpoint-out-of-range', '[0].low']]);
		expect(problems[0].message).toContain('outside -40…215 °C (the values its bit field can carry');
	});

	it('reports an empty or inverted band as an error, and a deadband that closes the band as a warning', () => {
		const problems = validateAlertRules(
			[
				rule({ name: 'Inverted', condition: 'outside', low: 60, high: 40 }),
				rule({ name: 'Empty', condition: 'outside', low: 40, high: 40 }),
				rule({ name: 'Closed', condition: 'outside', low: 40, high: 60, deadband: 10 })
			],
			map
		);
		expect(problems.map((p) => [p.severity, p.code, p.path])).toEqual([
			['error', 'band-inverted', '[0].low'],
			['error', 'band-inverted', '[1].low'],
			['warning', 'deadband-closes-band', '[2].deadband']
		]);
	});

	it('reports duplicate rule names (ignoring case) and ids as errors', () => {
		const problems = validateAlertRules(
			[
				rule({ name: 'Throttle', id: 'a' }),
				rule({ name: 'THROTTLE', id: 'b' }),
				rule({ name: 'Other', id: 'a' })
			],
			map
		);
		expect(problems.map((p) => [p.code, p.path, p.message])).toEqual([
			[
				'duplicate-rule-name',
				'[1].name',
				'rule name "THROTTLE" is already used by rule 0 (names are compared ignoring case)'
			],
			['duplicate-rule-id', '[2].id', 'rule id "a" is already used by rule 0']
		]);
	});
});
