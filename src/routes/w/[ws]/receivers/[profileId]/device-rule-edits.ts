/**
 * Editing one field of a device alert rule from the table's text: every edit goes back through the
 * profile's rule schema, so the table shows the messages an import of the profile file would.
 */
import { DEFAULT_ALERT_MESSAGE, type AlertCondition } from '$lib/can/alerts/rule';
import {
	deviceAlertRuleSchema,
	type DeviceAlertRule,
	type WantedChannel
} from '$lib/can/receivers/profile';
import type { RuleEdit, RuleField } from '$lib/components/alert-rule-table';

export type DeviceRuleEdit = RuleEdit<DeviceAlertRule>;

const NUMBER_FIELDS: readonly RuleField[] = [
	'setpoint',
	'low',
	'high',
	'deadband',
	'onDelayS',
	'offDelayS'
];

/** A single setpoint becomes a band around it and back, so a condition change keeps the figures. */
function withCondition(rule: DeviceAlertRule, condition: AlertCondition): Record<string, unknown> {
	const { setpoint, low, high, ...rest } = rule as DeviceAlertRule & {
		setpoint?: number;
		low?: number;
		high?: number;
	};
	if (condition === 'outside') {
		const from = low ?? setpoint ?? 0;
		const to = high ?? from + 1;
		return { ...rest, condition, low: from, high: to > from ? to : from + 1 };
	}
	return { ...rest, condition, setpoint: setpoint ?? (condition === 'above' ? high : low) };
}

export function editDeviceRule(
	rule: DeviceAlertRule,
	field: RuleField,
	text: string
): DeviceRuleEdit {
	let candidate: Record<string, unknown>;
	if (field === 'condition') {
		if (text !== 'above' && text !== 'below' && text !== 'outside')
			return { ok: false, message: 'choose above, below or outside a band' };
		candidate = withCondition(rule, text);
	} else if (field === 'latching') candidate = { ...rule, latching: text === 'true' };
	else if (NUMBER_FIELDS.includes(field)) {
		const trimmed = text.trim().replace(',', '.');
		const n = Number(trimmed);
		if (trimmed === '' || !Number.isFinite(n))
			return {
				ok: false,
				message: trimmed === '' ? 'enter a number' : `"${trimmed}" is not a number`
			};
		candidate = { ...rule, [field]: n };
	} else candidate = { ...rule, [field]: text };
	const parsed = deviceAlertRuleSchema.safeParse(candidate);
	return parsed.success
		? { ok: true, rule: parsed.data }
		: { ok: false, message: parsed.error.issues.map((i) => i.message).join('; ') };
}

/** A new advisory rule on the first wanted channel, above its display max, with an unused id. */
export function newDeviceRule(
	wanted: readonly WantedChannel[],
	existing: readonly DeviceAlertRule[]
): DeviceAlertRule {
	const ids = new Set(existing.map((r) => r.id));
	let n = existing.length + 1;
	while (ids.has(`rule-${n}`)) n++;
	const channel = wanted[0];
	return deviceAlertRuleSchema.parse({
		id: `rule-${n}`,
		name: `New rule ${n}`,
		channel: channel?.name ?? 'channel',
		severity: 'advisory',
		condition: 'above',
		setpoint: channel?.max ?? 0,
		message: DEFAULT_ALERT_MESSAGE
	});
}
