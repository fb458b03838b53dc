import { describe, expect, it } from 'vitest';
import { alertRuleSchema, type AlertRule } from '$lib/can/alerts/rule';
import { canMapSchema } from '$lib/can/map';
import {
	channelOptions,
	editRuleField,
	newAlertRule,
	unlistedChannelNote
} from './alert-rule-fields';

// Demo data: an invented two-signal frame, not a check value.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Rules demo',
	frames: [
		{ name: 'Empty', id: '0x100' },
		{
			name: 'Temps',
			id: '0x101',
			signals: [
				{ name: 'Coolant', startBit: 0, length: 8, offset: -40, unit: '°C', max: 105 },
				{ name: 'Oil', startBit: 8, length: 8 }
			]
		}
	]
});
const rule: AlertRule = alertRuleSchema.parse({
	id: 'r1',
	name: 'Hot',
	channel: { frame: 'Temps', signal: 'Coolant' },
	severity: 'advisory',
	condition: 'above',
	setpoint: 100
});

describe('alert rule table helpers', () => {
	it('offers every signal of every frame as a channel', () => {
		expect(channelOptions(map.frames).map((c) => [c.label, c.unit])).toEqual([
			['Temps / Coolant', '°C'],
			['Temps / Oil', '']
		]);
	});

	it('applies a number typed with a decimal comma and refuses text that is not a number', () => {
		expect(editRuleField(rule, 'deadband', '2,5')).toMatchObject({
			ok: true,
			rule: { deadband: 2.5 }
		});
		expect(editRuleField(rule, 'setpoint', 'hot')).toEqual({
			ok: false,
			message: '"hot" is not a number'
		});
		expect(editRuleField(rule, 'setpoint', ' ')).toEqual({ ok: false, message: 'enter a number' });
	});

	it('passes every edit through the rule schema, with its messages', () => {
		expect(editRuleField(rule, 'onDelayS', '-1')).toEqual({
			ok: false,
			message: 'on-delay must be 0 or more seconds'
		});
		const badMessage = editRuleField(rule, 'message', '{name} at {temperature}');
		expect(badMessage.ok ? '' : badMessage.message).toMatch(
			/unknown placeholder "\{temperature\}"/
		);
		expect(editRuleField(rule, 'channel', 'Temps\u0000Oil')).toMatchObject({
			ok: true,
			rule: { channel: { frame: 'Temps', signal: 'Oil' } }
		});
		expect(editRuleField(rule, 'latching', 'true')).toMatchObject({
			ok: true,
			rule: { latching: true }
		});
	});

	it('turns a setpoint into a band and back without losing the other fields', () => {
		const band = editRuleField({ ...rule, deadband: 1 }, 'condition', 'outside');
		expect(band).toMatchObject({
			ok: true,
			rule: { condition: 'outside', high: 100, deadband: 1 }
		});
		expect(band.ok && 'setpoint' in band.rule).toBe(false);
		if (!band.ok || band.rule.condition !== 'outside') throw new Error('expected a band');
		expect(band.rule.low).toBeLessThan(100);
		expect(editRuleField(band.rule, 'condition', 'below')).toMatchObject({
			ok: true,
			rule: { condition: 'below', setpoint: band.rule.low, deadband: 1 }
		});
	});

	it('adds a rule on the first signal with an unused id and name', () => {
		const first = newAlertRule(map.frames, []);
		expect(first).toMatchObject({
			id: 'rule-1',
			name: 'New rule 1',
			channel: { frame: 'Temps', signal: 'Coolant' },
			setpoint: 105
		});
		const second = newAlertRule(map.frames, [first, { ...first, id: 'rule-2', name: 'Other' }]);
		expect(second.id).toBe('rule-3');
	});

	// Demo data (invented): a frame whose first signals are a counter and a checksum.
	const guarded = canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'Roles demo',
		frames: [
			{
				name: 'Guarded',
				id: '0x200',
				signals: [
					{ name: 'Alive', startBit: 0, length: 4, role: 'counter' },
					{ name: 'Crc', startBit: 8, length: 8, role: 'checksum' },
					{ name: 'Boost', startBit: 16, length: 8, unit: 'kPa', max: 250 }
				]
			}
		]
	});

	it('offers no counter or checksum as a channel, and a new rule starts on the first value', () => {
		expect(channelOptions(guarded.frames).map((c) => c.label)).toEqual(['Guarded / Boost']);
		expect(newAlertRule(guarded.frames, []).channel).toEqual({ frame: 'Guarded', signal: 'Boost' });
	});

	it('says why a rule’s channel is not offered: a counter, a checksum or missing', () => {
		const note = (signal: string) =>
			unlistedChannelNote(guarded.frames, { frame: 'Guarded', signal });
		expect([note('Alive'), note('Crc'), note('Gone')]).toEqual(['counter', 'checksum', 'missing']);
		expect(unlistedChannelNote(guarded.frames, { frame: 'Nowhere', signal: 'Boost' })).toBe(
			'missing'
		);
	});
});
