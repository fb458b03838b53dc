/** Per-rule totals of replayed alert events, for the summary beside the timeline. */
import { z } from 'zod';
import type { AlertEvent } from './evaluate';
import { alertSeveritySchema } from './rule';

export const alertRuleSummarySchema = z.object({
	rule: z.string(),
	severity: alertSeveritySchema,
	count: z.number().int(),
	/** Sum of event durations in seconds (latched time included: it counts as active). */
	totalActiveS: z.number(),
	latchedCount: z.number().int(),
	/** Events still active (or latched) at the end of the recording. */
	openCount: z.number().int()
});
export type AlertRuleSummary = z.infer<typeof alertRuleSummarySchema>;

/** One summary per rule, in the order each rule first appears among the events. */
export function summarizeAlertEvents(events: readonly AlertEvent[]): AlertRuleSummary[] {
	const byRule = new Map<string, AlertRuleSummary>();
	for (const event of events) {
		let summary = byRule.get(event.rule);
		if (!summary) {
			summary = {
				rule: event.rule,
				severity: event.severity,
				count: 0,
				totalActiveS: 0,
				latchedCount: 0,
				openCount: 0
			};
			byRule.set(event.rule, summary);
		}
		summary.count++;
		summary.totalActiveS += event.duration;
		if (event.latched) summary.latchedCount++;
		if (event.end === null) summary.openCount++;
	}
	return [...byRule.values()];
}
