import { json } from '@sveltejs/kit';
import { processCaptureInputSchema, type ProcessResponse } from '$lib/api/captures';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { startProcessing } from '$lib/server/captures/processing';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Starts parsing with the confirmed layout; poll …/status for progress. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'viewer');
	const { layout } = await readJsonBody(event.request, processCaptureInputSchema);
	const capture = await startProcessing(event.locals.services, {
		workspaceId: workspace.id,
		captureId: event.params.id,
		layout,
		actorId: user.id
	});
	return json({ capture } satisfies ProcessResponse, { status: 202 });
});
