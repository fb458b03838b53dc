import { json } from '@sveltejs/kit';
import {
	alertReplayInputSchema,
	replayAlertRules,
	UnknownRuleError,
	type AlertReplay
} from '$lib/can/alerts/replay';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { getDecoded } from '$lib/server/captures/decoding';
import { requireRole } from '$lib/server/guard';
import { Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/**
 * `{ decode, acknowledgements? }` → the alert rules of the map revision (or draft version) that
 * decode used, replayed over its channels: `{ rules, events, summary }`. Nothing is stored, so
 * viewers may replay acknowledgements freely.
 */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const input = await readJsonBody(event.request, alertReplayInputSchema);
	const { map, result } = await getDecoded(
		event.locals.services,
		workspace.id,
		event.params.id,
		input.decode
	);
	try {
		return json(
			replayAlertRules(
				map,
				result.channels,
				result.duration,
				input.acknowledgements
			) satisfies AlertReplay
		);
	} catch (error) {
		if (error instanceof UnknownRuleError) {
			throw new Problem(400, "An acknowledgement names a rule this decode's map does not have.", [
				{ path: `acknowledgements.${error.index}.ruleId`, message: error.message }
			]);
		}
		throw error;
	}
});
