/**
 * Replays every alert rule of a map over the decoded channels of a capture: the body of
 * `POST …/captures/[id]/alerts`, kept pure so the browser, the server and tests share it.
 */
import { z } from 'zod';
import type { ChannelInfo } from '../decoder';
import type { CanMap } from '../map';
import { alertEventSchema, evaluateAlertRule } from './evaluate';
import { alertRuleSchema, formatAlertMessage } from './rule';
import { alertRuleSummarySchema, summarizeAlertEvents } from './summary';

export const alertReplayInputSchema = z.strictObject({
	decode: z
		.string({ error: 'name the decode to replay the rules over (its id)' })
		.trim()
		.min(1, 'name the decode to replay the rules over (its id)'),
	acknowledgements: z
		.array(
			z.strictObject({
				ruleId: z
					.string({ error: 'ruleId must be the id of a rule' })
					.min(1, 'ruleId must be the id of a rule'),
				time: z.number({ error: 'time must be a number of seconds from the start of the capture' })
			})
		)
		.max(10_000, 'at most 10,000 acknowledgements')
		.default([])
});
export type AlertReplayInput = z.input<typeof alertReplayInputSchema>;

/** The channel samples a replay needs (a decoded capture's channels have these and more). */
export interface ReplayChannel {
	info: Pick<ChannelInfo, 'index' | 'frameName' | 'signalName' | 'unit'>;
	time: Float64Array;
	value: Float64Array;
}

const replayExtras = {
	/** The decoded channel the rule watches; null when the map has no such signal (a lint error). */
	channelIndex: z.number().int().nullable(),
	unit: z.string()
};
/** A rule as replayed: the rule itself, and the channel it watched. */
export const replayedRuleSchema = z.discriminatedUnion('condition', [
	alertRuleSchema.options[0].extend(replayExtras),
	alertRuleSchema.options[1].extend(replayExtras),
	alertRuleSchema.options[2].extend(replayExtras)
]);
export type ReplayedRule = z.output<typeof replayedRuleSchema>;

export const replayedEventSchema = alertEventSchema.extend({
	ruleName: z.string(),
	channelIndex: z.number().int(),
	/** The rule's message filled in with the event's peak value. */
	message: z.string()
});
export type ReplayedEvent = z.infer<typeof replayedEventSchema>;

/** The answer of `POST …/captures/[id]/alerts`. */
export const alertReplaySchema = z.object({
	rules: z.array(replayedRuleSchema),
	events: z.array(replayedEventSchema),
	/** One per rule, in rule order, zero counts included. */
	summary: z.array(alertRuleSummarySchema),
	/** End of the recording the rules ran over (seconds from its first frame): where open events stop. */
	endTime: z.number()
});
export type AlertReplay = z.output<typeof alertReplaySchema>;

export class UnknownRuleError extends Error {
	constructor(
		readonly index: number,
		readonly ruleId: string
	) {
		super(`acknowledgement ${index} names rule "${ruleId}", which this map revision does not have`);
	}
}

/**
 * Runs each rule over its channel. `endTime` is the end of the recording (seconds, same base as
 * the channels' time), so an alert still active at the end lasts until then, not until the last sample.
 */
export function replayAlertRules(
	map: Pick<CanMap, 'alertRules'>,
	channels: readonly ReplayChannel[],
	endTime: number,
	acknowledgements: readonly { ruleId: string; time: number }[] = []
): AlertReplay {
	const ruleIds = new Set(map.alertRules.map((r) => r.id));
	acknowledgements.forEach((ack, i) => {
		if (!ruleIds.has(ack.ruleId)) throw new UnknownRuleError(i, ack.ruleId);
	});
	const rules: ReplayedRule[] = [];
	const events: ReplayedEvent[] = [];
	for (const rule of map.alertRules) {
		const channel = channels.find(
			(c) => c.info.frameName === rule.channel.frame && c.info.signalName === rule.channel.signal
		);
		rules.push({
			...rule,
			channelIndex: channel?.info.index ?? null,
			unit: channel?.info.unit ?? ''
		});
		if (!channel) continue;
		const acks = acknowledgements.filter((a) => a.ruleId === rule.id).map((a) => a.time);
		const { events: found } = evaluateAlertRule(rule, channel.time, channel.value, {
			acknowledgements: acks,
			endTime
		});
		for (const event of found) {
			events.push({
				...event,
				ruleName: rule.name,
				channelIndex: channel.info.index,
				message: formatAlertMessage(rule, event.peak, channel.info.unit)
			});
		}
	}
	events.sort((a, b) => a.start - b.start);
	const byRule = new Map(summarizeAlertEvents(events).map((s) => [s.rule, s]));
	const summary = map.alertRules.map(
		(rule) =>
			byRule.get(rule.id) ?? {
				rule: rule.id,
				severity: rule.severity,
				count: 0,
				totalActiveS: 0,
				latchedCount: 0,
				openCount: 0
			}
	);
	return { rules, events, summary, endTime };
}
