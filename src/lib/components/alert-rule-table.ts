/**
 * What the alert rules table (AlertRulesEditor.svelte) needs of a rule, for map rules and device
 * rules alike: the editable fields, the condition and severity choices, and the setpoint(s) a
 * condition uses.
 */
import { SEVERITY_LABELS, type AlertCondition, type AlertSeverity } from '$lib/can/alerts/rule';

/** The fields of a rule shared by map rules and device rules; the channel's shape differs. */
export interface AlertRuleLike {
	id: string;
	name: string;
	condition: AlertCondition;
	severity: AlertSeverity;
	deadband: number;
	onDelayS: number;
	offDelayS: number;
	latching: boolean;
	message: string;
	setpoint?: number;
	low?: number;
	high?: number;
}

export type RuleField =
	| 'name'
	| 'channel'
	| 'condition'
	| 'setpoint'
	| 'low'
	| 'high'
	| 'severity'
	| 'deadband'
	| 'onDelayS'
	| 'offDelayS'
	| 'latching'
	| 'message';

export type RuleEdit<R> = { ok: true; rule: R } | { ok: false; message: string };

export const CONDITION_LABELS: Record<AlertCondition, string> = {
	above: 'above',
	below: 'below',
	outside: 'outside a band'
};
export const CONDITION_OPTIONS = Object.entries(CONDITION_LABELS).map(([value, label]) => ({
	value,
	label
}));
export const SEVERITY_OPTIONS = (['advisory', 'critical'] as const).map((value) => ({
	value,
	label: SEVERITY_LABELS[value]
}));

/** The setpoint fields a condition uses. */
export function setpointFields(condition: AlertCondition): ('setpoint' | 'low' | 'high')[] {
	return condition === 'outside' ? ['low', 'high'] : ['setpoint'];
}

/** "95 °C" or "10 … 20 bar": the setpoint or band as the read-only table shows it. */
export function setpointText(
	rule: Pick<AlertRuleLike, 'condition' | 'setpoint' | 'low' | 'high'>,
	unit: string
): string {
	const value = rule.condition === 'outside' ? `${rule.low} … ${rule.high}` : rule.setpoint;
	return `${value} ${unit}`;
}
