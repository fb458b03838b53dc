import { json } from '@sveltejs/kit';
import { alertReplayInputSchema, type AlertReplay } from '$lib/can/alerts/replay';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { replayDecodeAlerts } from '$lib/server/captures/alerts';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/**
 * `{ decode, acknowledgements? }` → the alert rules of the map revision (or draft version) that
 * decode used, replayed over its channels: `{ rules, events, summary }`.
 */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const input = await readJsonBody(event.request, alertReplayInputSchema);
	const replay = await replayDecodeAlerts(
		event.locals.services,
		workspace.id,
		event.params.id,
		input
	);
	return json(replay satisfies AlertReplay);
});
