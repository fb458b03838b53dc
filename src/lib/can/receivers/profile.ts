/**
 * The receiver profile model (`framewright-profile@1`): a device that listens on the bus and the
 * channels it wants, each with its quantity, the unit it shows and its display range, plus the
 * device's own alert rules. zod is the single definition; docs/receivers.md describes the format.
 */
import { z } from 'zod';
import { alertRuleSchema } from '../alerts/rule';
import { parseJsonDocument, type ParseDocumentResult } from '../map-json';
import { fuelSchema, quantitySchema } from './quantities';
import { unitQuantityProblem } from './unit-table';

export const PROFILE_FORMAT = 'framewright-profile@1';

export const RECEIVER_KINDS = ['display', 'logger', 'power-module', 'other'] as const;
export const receiverKindSchema = z.enum(RECEIVER_KINDS, {
	error: `kind must be one of ${RECEIVER_KINDS.join(', ')}`
});
export type ReceiverKind = z.infer<typeof receiverKindSchema>;

/** How a kind of receiver is shown to people. */
export const RECEIVER_KIND_LABELS: Record<ReceiverKind, string> = {
	display: 'display',
	logger: 'logger',
	'power-module': 'power module',
	other: 'other device'
};

const finite = (what: string) => z.number({ error: `${what} must be a finite number` });

export const wantedChannelSchema = z
	.strictObject({
		name: z
			.string({ error: 'a wanted channel needs a name' })
			.trim()
			.min(1, 'a wanted channel needs a name')
			.max(120, 'a name must be at most 120 characters'),
		quantity: quantitySchema,
		unit: z
			.string()
			.trim()
			.max(40, 'a unit must be at most 40 characters')
			.default('')
			.describe('the unit the device shows'),
		min: finite('min').nullable().default(null).describe('lowest value the device displays'),
		max: finite('max').nullable().default(null).describe('highest value the device displays'),
		decimals: z
			.number({ error: 'decimals must be a whole number from 0 to 9' })
			.int('decimals must be a whole number from 0 to 9')
			.min(0, 'decimals must be a whole number from 0 to 9')
			.max(9, 'decimals must be a whole number from 0 to 9')
			.default(0),
		required: z
			.boolean({ error: 'required must be true or false' })
			.default(false)
			.describe('the device is of no use without this channel'),
		fuel: fuelSchema
			.nullable()
			.default(null)
			.describe('for an air–fuel ratio: the fuel whose stoichiometric ratio the device uses'),
		notes: z.string().max(2000, 'notes must be at most 2000 characters').default('')
	})
	.superRefine((channel, ctx) => {
		const problem = unitQuantityProblem(channel.unit, channel.quantity);
		if (problem) ctx.addIssue({ code: 'custom', path: ['unit'], message: problem });
		if (channel.min !== null && channel.max !== null && channel.min >= channel.max)
			ctx.addIssue({
				code: 'custom',
				path: ['max'],
				message: `display range ${channel.min}…${channel.max} is empty; max must be above min`
			});
	});
export type WantedChannel = z.output<typeof wantedChannelSchema>;
export type WantedChannelInput = z.input<typeof wantedChannelSchema>;

const wantedRef = z
	.string({ error: 'name the wanted channel the rule watches' })
	.trim()
	.min(1, 'name the wanted channel the rule watches')
	.describe('the wanted channel the rule watches, by name; setpoints are in its unit');

/**
 * A device alert: the map's alert rule (severity, deadband, delays, latching, message) watching a
 * wanted channel instead of a map signal, with setpoints in the unit the device shows.
 */
const [aboveRule, belowRule, outsideRule] = alertRuleSchema.options;
export const deviceAlertRuleSchema = z.discriminatedUnion(
	'condition',
	[
		aboveRule.extend({ channel: wantedRef }),
		belowRule.extend({ channel: wantedRef }),
		outsideRule.extend({ channel: wantedRef })
	],
	{ error: 'condition must be "above", "below" or "outside"' }
);
export type DeviceAlertRule = z.output<typeof deviceAlertRuleSchema>;

/** A link the profile's author fixed by hand: wanted channel → frame · signal, by name. */
export const manualLinkSchema = z.strictObject({
	wanted: z
		.string({ error: 'name the wanted channel to link' })
		.trim()
		.min(1, 'name the wanted channel to link'),
	frame: z
		.string({ error: 'name the frame that carries the signal' })
		.trim()
		.min(1, 'name the frame that carries the signal'),
	signal: z.string({ error: 'name the signal to link' }).trim().min(1, 'name the signal to link')
});
export type ManualLink = z.output<typeof manualLinkSchema>;

export const receiverProfileSchema = z
	.strictObject({
		format: z.literal(PROFILE_FORMAT),
		name: z
			.string({ error: 'a profile needs a name' })
			.trim()
			.min(1, 'a profile needs a name')
			.max(200, 'a name must be at most 200 characters'),
		kind: receiverKindSchema,
		notes: z.string().max(4000, 'notes must be at most 4000 characters').default(''),
		wanted: z.array(wantedChannelSchema).max(1000, 'at most 1000 wanted channels').default([]),
		manualLinks: z
			.array(manualLinkSchema)
			.default([])
			.describe('links fixed by hand; linking keeps them and links the rest automatically'),
		alertRules: z
			.array(deviceAlertRuleSchema)
			.default([])
			.describe("the device's own alert rules on its wanted channels")
	})
	.superRefine((profile, ctx) => {
		const seen = new Map<string, number>();
		profile.wanted.forEach((channel, i) => {
			const key = channel.name.toLowerCase();
			const first = seen.get(key);
			if (first === undefined) seen.set(key, i);
			else
				ctx.addIssue({
					code: 'custom',
					path: ['wanted', i, 'name'],
					message: `wanted channel "${channel.name}" is already wanted[${first}] (names are compared ignoring case)`
				});
		});
		const known = (name: string) => seen.has(name.toLowerCase());
		const pinned = new Set<string>();
		profile.manualLinks.forEach((link, i) => {
			if (!known(link.wanted))
				ctx.addIssue({
					code: 'custom',
					path: ['manualLinks', i, 'wanted'],
					message: `"${link.wanted}" is not a wanted channel of this profile`
				});
			if (pinned.has(link.wanted.toLowerCase()))
				ctx.addIssue({
					code: 'custom',
					path: ['manualLinks', i, 'wanted'],
					message: `"${link.wanted}" is linked by hand twice`
				});
			pinned.add(link.wanted.toLowerCase());
		});
		const ids = new Set<string>();
		profile.alertRules.forEach((rule, i) => {
			if (!known(rule.channel))
				ctx.addIssue({
					code: 'custom',
					path: ['alertRules', i, 'channel'],
					message: `rule "${rule.name}" watches "${rule.channel}", which is not a wanted channel of this profile`
				});
			if (ids.has(rule.id))
				ctx.addIssue({
					code: 'custom',
					path: ['alertRules', i, 'id'],
					message: `rule id "${rule.id}" is used twice`
				});
			ids.add(rule.id);
			if (rule.condition === 'outside' && rule.low >= rule.high)
				ctx.addIssue({
					code: 'custom',
					path: ['alertRules', i, 'low'],
					message: `rule "${rule.name}" has band low ${rule.low} not below high ${rule.high}`
				});
		});
	});
export type ReceiverProfile = z.output<typeof receiverProfileSchema>;
export type ReceiverProfileInput = z.input<typeof receiverProfileSchema>;

/** The wanted channel of a profile by name (ignoring case, as names are unique that way). */
export function findWanted(profile: ReceiverProfile, name: string): WantedChannel | undefined {
	const key = name.trim().toLowerCase();
	return profile.wanted.find((w) => w.name.toLowerCase() === key);
}

/** Parse JSON text or a value into a validated profile, or list every problem by JSON path. */
export function parseProfile(input: string | unknown): ParseDocumentResult<ReceiverProfile> {
	return parseJsonDocument(input, receiverProfileSchema, PROFILE_FORMAT);
}

/** JSON Schema (draft 2020-12) of the profile file: the input side, so defaulted fields are optional. */
export function profileJsonSchema(): Record<string, unknown> {
	return {
		...z.toJSONSchema(receiverProfileSchema, { io: 'input' }),
		$id: 'https://framewright.invalid/schema/framewright-profile.schema.json',
		title: 'Framewright receiver profile',
		description:
			'A receiver profile (format framewright-profile@1): a device listening on the bus, the channels it wants with quantity, unit and display range, links fixed by hand and the device alert rules.'
	};
}

/** The profile as a `framewright-profile@1` file: pretty JSON, every field written out. */
export function serializeProfile(profile: ReceiverProfile): string {
	return `${JSON.stringify(profile, null, 2)}\n`;
}
