/**
 * Editing one alert rule field from the table's text: every edit goes back through the zod rule
 * schema, so the table shows the same messages an import of the JSON file would.
 */
import {
	alertRuleSchema,
	DEFAULT_ALERT_MESSAGE,
	type AlertCondition,
	type AlertRule
} from '$lib/can/alerts/rule';
import type { Frame } from '$lib/can/map';
import { ROLE_BADGE, valueChannels } from '$lib/signal-roles';
import type { RuleEdit, RuleField } from '$lib/components/alert-rule-table';

export type EditResult = RuleEdit<AlertRule>;

/**
 * "Frame / Signal" choices for the channel picker, as `frame\u0000signal` values. Counters and
 * checksums are not offered: a limit on them means nothing physical (docs/map-format.md, "Signal
 * roles"); a rule that already watches one keeps it, and validation warns.
 */
export function channelOptions(
	frames: readonly Frame[]
): { value: string; label: string; unit: string }[] {
	return frames.flatMap((f) =>
		valueChannels(f.signals).map((s) => ({
			value: channelKey(f.name, s.name),
			label: `${f.name} / ${s.name}`,
			unit: s.unit
		}))
	);
}

/** Why a rule's channel is not among `channelOptions`: the map lacks it, or it is a counter/checksum. */
export function unlistedChannelNote(
	frames: readonly Frame[],
	channel: { frame: string; signal: string }
): string {
	const signal = frames
		.find((f) => f.name === channel.frame)
		?.signals.find((s) => s.name === channel.signal);
	return (signal && ROLE_BADGE[signal.role]) ?? 'missing';
}

export function channelKey(frame: string, signal: string): string {
	return `${frame}\u0000${signal}`;
}

function numberFrom(text: string): number | string {
	const trimmed = text.trim();
	if (trimmed === '') return 'enter a number';
	const n = Number(trimmed.replace(',', '.')); // a decimal comma from a European keyboard is meant as a point
	return Number.isFinite(n) ? n : `"${trimmed}" is not a number`;
}

/** Keeps the rule's own fields when the condition changes: a single setpoint becomes a band around it and back. */
function withCondition(rule: AlertRule, condition: AlertCondition): Record<string, unknown> {
	const { condition: _c, ...rest } = rule as AlertRule & {
		setpoint?: number;
		low?: number;
		high?: number;
	};
	delete rest.setpoint;
	delete rest.low;
	delete rest.high;
	if (condition === 'outside') {
		const low =
			rule.condition === 'outside' ? rule.low : rule.condition === 'below' ? rule.setpoint : 0;
		const high =
			rule.condition === 'outside'
				? rule.high
				: rule.condition === 'above'
					? rule.setpoint
					: low + 1;
		return { ...rest, condition, low, high: high > low ? high : low + 1 };
	}
	const setpoint =
		rule.condition !== 'outside' ? rule.setpoint : condition === 'above' ? rule.high : rule.low;
	return { ...rest, condition, setpoint };
}

/** The rule with `field` set from the text the person typed, or why the text cannot be used. */
export function editRuleField(rule: AlertRule, field: RuleField, text: string): EditResult {
	let candidate: Record<string, unknown>;
	switch (field) {
		case 'channel': {
			const [frame, signal] = text.split('\u0000');
			candidate = { ...rule, channel: { frame, signal: signal ?? '' } };
			break;
		}
		case 'condition':
			if (text !== 'above' && text !== 'below' && text !== 'outside')
				return { ok: false, message: 'choose above, below or outside a band' };
			candidate = withCondition(rule, text);
			break;
		case 'latching':
			candidate = { ...rule, latching: text === 'true' };
			break;
		case 'setpoint':
		case 'low':
		case 'high':
		case 'deadband':
		case 'onDelayS':
		case 'offDelayS': {
			const n = numberFrom(text);
			if (typeof n === 'string') return { ok: false, message: n };
			candidate = { ...rule, [field]: n };
			break;
		}
		default:
			candidate = { ...rule, [field]: text };
	}
	const parsed = alertRuleSchema.safeParse(candidate);
	if (parsed.success) return { ok: true, rule: parsed.data };
	return { ok: false, message: parsed.error.issues.map((i) => i.message).join('; ') };
}

/** A new rule on the first signal of the map, above its max (or 0), with an id no other rule has. */
export function newAlertRule(frames: readonly Frame[], existing: readonly AlertRule[]): AlertRule {
	const ids = new Set(existing.map((r) => r.id));
	const names = new Set(existing.map((r) => r.name.toLowerCase()));
	let n = existing.length + 1;
	while (ids.has(`rule-${n}`) || names.has(`new rule ${n}`)) n++;
	const frame = frames.find((f) => valueChannels(f.signals).length > 0);
	const signal = frame && valueChannels(frame.signals)[0];
	return alertRuleSchema.parse({
		id: `rule-${n}`,
		name: `New rule ${n}`,
		channel: { frame: frame?.name ?? 'frame', signal: signal?.name ?? 'signal' },
		severity: 'advisory',
		condition: 'above',
		setpoint: signal?.max ?? 0,
		message: DEFAULT_ALERT_MESSAGE
	});
}
