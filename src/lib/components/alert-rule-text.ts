/**
 * An alert rule in words for printed sheets, map rules and device rules alike: its condition and
 * how it behaves (deadband, delays, latching), with the channel's unit.
 */
import type { AlertCondition } from '$lib/can/alerts/rule';

type RuleText = { condition: AlertCondition; setpoint?: number; low?: number; high?: number };
type RuleBehaviour = { deadband: number; onDelayS: number; offDelayS: number; latching: boolean };

export function conditionText(rule: RuleText, unit: string): string {
	const u = unit ? ` ${unit}` : '';
	if (rule.condition === 'above') return `above ${rule.setpoint}${u}`;
	if (rule.condition === 'below') return `below ${rule.setpoint}${u}`;
	return `outside ${rule.low} to ${rule.high}${u}`;
}

export function behaviourText(rule: RuleBehaviour, unit: string): string {
	return [
		rule.deadband ? `deadband ${rule.deadband}${unit ? ` ${unit}` : ''}` : 'no deadband',
		rule.onDelayS ? `on after ${rule.onDelayS} s` : 'on at once',
		rule.offDelayS ? `off after ${rule.offDelayS} s` : 'off at once',
		rule.latching ? 'latches until acknowledged' : 'clears on return'
	].join(' · ');
}
