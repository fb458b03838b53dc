import { json } from '@sveltejs/kit';
import type { AlertReplay } from '$lib/can/alerts/replay';
import { deviceAlertsInputSchema } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { replayProfileAlerts } from '$lib/server/receivers/capture-check';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const input = await readJsonBody(event.request, deviceAlertsInputSchema);
	const replay = await replayProfileAlerts(
		event.locals.services,
		workspace.id,
		event.params.profileId,
		input
	);
	return json(replay satisfies AlertReplay);
});
