/**
 * The alert rule model: a condition on one channel (a map signal) with a severity, deadband
 * (hysteresis), on/off delays, latching and a message template. zod is the single definition of
 * the shape; checks that need the map (does the channel exist, is the setpoint reachable) live in
 * validate.ts, like lint.ts beside map.ts.
 */
import { z } from 'zod';

export const alertSeveritySchema = z.enum(['advisory', 'critical']);
export type AlertSeverity = z.infer<typeof alertSeveritySchema>;

/** How a severity is shown to people. */
export const SEVERITY_LABELS: Record<AlertSeverity, string> = {
	advisory: 'Advisory',
	critical: 'Critical'
};

export const MESSAGE_PLACEHOLDERS = ['value', 'unit', 'setpoint', 'name'] as const;
export const DEFAULT_ALERT_MESSAGE = '{name}: {value} {unit}';

/** Longest delay accepted: a day, far beyond any sensible alert but finite. */
const MAX_DELAY_S = 86_400;

// zod 4 numbers already refuse NaN and ±Infinity.
const finite = (what: string) => z.number({ error: `${what} must be a finite number` });
const delay = (what: string) =>
	z
		.number({ error: `${what} must be a number of seconds` })
		.min(0, `${what} must be 0 or more seconds`)
		.max(MAX_DELAY_S, `${what} must be at most ${MAX_DELAY_S} s (one day)`)
		.default(0);

/** Problems with a message template: every `{…}` must be a known placeholder, braces must pair. */
export function templateProblems(template: string): string[] {
	const problems: string[] = [];
	const allowed = MESSAGE_PLACEHOLDERS.map((p) => `{${p}}`).join(', ');
	for (const match of template.matchAll(/\{([^{}]*)\}/g)) {
		if (!(MESSAGE_PLACEHOLDERS as readonly string[]).includes(match[1])) {
			problems.push(`unknown placeholder "{${match[1]}}"; use ${allowed}`);
		}
	}
	if (/[{}]/.test(template.replace(/\{[^{}]*\}/g, ''))) {
		problems.push(`a "{" or "}" is not part of a placeholder; placeholders look like ${allowed}`);
	}
	return problems;
}

const messageSchema = z
	.string()
	.max(500, 'a message must be at most 500 characters')
	.default(DEFAULT_ALERT_MESSAGE)
	.superRefine((template, ctx) => {
		for (const message of templateProblems(template)) ctx.addIssue({ code: 'custom', message });
	});

const ruleBase = z.strictObject({
	id: z.string().trim().min(1, 'a rule needs an id').max(64, 'an id must be at most 64 characters'),
	name: z
		.string()
		.trim()
		.min(1, 'a rule needs a name')
		.max(120, 'a name must be at most 120 characters'),
	channel: z
		.strictObject({
			frame: z.string().trim().min(1, 'name the frame that carries the signal'),
			signal: z.string().trim().min(1, 'name the signal the rule watches')
		})
		.describe('the channel: a signal of a frame of the map, by name'),
	severity: alertSeveritySchema,
	deadband: z
		.number({ error: 'deadband must be a finite number' })
		.min(0, 'deadband must be 0 or more (in the signal unit)')
		.default(0)
		.describe(
			'hysteresis in the signal unit: how far back past the setpoint the value must go to return'
		),
	onDelayS: delay('on-delay').describe(
		'seconds the condition must hold before the alert activates'
	),
	offDelayS: delay('off-delay').describe(
		'seconds the return condition must hold before the alert returns'
	),
	latching: z.boolean({ error: 'latching must be true or false' }).default(false),
	message: messageSchema
});

export const alertRuleSchema = z.discriminatedUnion(
	'condition',
	[
		ruleBase.extend({ condition: z.literal('above'), setpoint: finite('setpoint') }),
		ruleBase.extend({ condition: z.literal('below'), setpoint: finite('setpoint') }),
		ruleBase.extend({
			condition: z.literal('outside'),
			low: finite('band low'),
			high: finite('band high')
		})
	],
	{ error: 'condition must be "above", "below" or "outside"' }
);
export type AlertRule = z.output<typeof alertRuleSchema>;
export type AlertRuleInput = z.input<typeof alertRuleSchema>;
export type AlertCondition = AlertRule['condition'];

export const alertRulesSchema = z.array(alertRuleSchema);

/** Whether `value` is beyond the rule's setpoint(s): the condition that activates the alert. */
export function isBeyond(rule: AlertRule, value: number): boolean {
	if (rule.condition === 'above') return value > rule.setpoint;
	if (rule.condition === 'below') return value < rule.setpoint;
	return value > rule.high || value < rule.low;
}

/** Whether `value` is back inside by more than the deadband: the condition that returns the alert. */
export function isReturned(rule: AlertRule, value: number): boolean {
	if (rule.condition === 'above') return value < rule.setpoint - rule.deadband;
	if (rule.condition === 'below') return value > rule.setpoint + rule.deadband;
	return value > rule.low + rule.deadband && value < rule.high - rule.deadband;
}

/**
 * How far a value goes in the alerting direction; the event's peak is the sample that maximises it.
 * For a band this is the distance outside it, on either side.
 */
export function excursion(rule: AlertRule, value: number): number {
	if (rule.condition === 'above') return value - rule.setpoint;
	if (rule.condition === 'below') return rule.setpoint - value;
	return Math.max(value - rule.high, rule.low - value);
}

/** Compact number text: whole numbers as is, others to 6 significant digits without trailing zeros. */
export function formatAlertNumber(value: number): string {
	if (!Number.isFinite(value)) return Number.isNaN(value) ? 'n/a' : String(value);
	return Number.isInteger(value) ? String(value) : String(Number.parseFloat(value.toPrecision(6)));
}

/** The setpoint a value is measured against: for a band, the limit on the value's side. */
function setpointText(rule: AlertRule, value: number): string {
	if (rule.condition !== 'outside') return formatAlertNumber(rule.setpoint);
	if (value > rule.high) return formatAlertNumber(rule.high);
	if (value < rule.low) return formatAlertNumber(rule.low);
	return `${formatAlertNumber(rule.low)}…${formatAlertNumber(rule.high)}`;
}

/** The rule's message with `{value}`, `{unit}`, `{setpoint}` and `{name}` filled in. */
export function formatAlertMessage(rule: AlertRule, value: number, unit: string): string {
	const fill: Record<(typeof MESSAGE_PLACEHOLDERS)[number], string> = {
		value: formatAlertNumber(value),
		unit,
		setpoint: setpointText(rule, value),
		name: rule.name
	};
	return rule.message
		.replace(/\{(value|unit|setpoint|name)\}/g, (_, key: keyof typeof fill) => fill[key])
		.trim();
}
