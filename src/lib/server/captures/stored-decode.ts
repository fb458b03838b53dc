/**
 * A stored decode read back from its JSON. Channel entries go through the contract's schema, so
 * a decode stored before a field existed gets that field's default (a decode stored before signal
 * roles reads every channel as a `value`, docs/map-format.md "Signal roles").
 */
import { channelSummarySchema } from '../../api/capture-views';
import type { StoredDecode } from './work/tasks';

export function readStoredDecode(text: string): StoredDecode {
	const stored = JSON.parse(text) as StoredDecode;
	return {
		...stored,
		summary: {
			...stored.summary,
			channels: stored.summary.channels.map((c) => channelSummarySchema.parse(c))
		}
	};
}
