import { json } from '@sveltejs/kit';
import { checkInputSchema, type CheckResponse } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { checkProfileOnCapture } from '$lib/server/receivers/capture-check';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const input = await readJsonBody(event.request, checkInputSchema);
	const checked = await checkProfileOnCapture(
		event.locals.services,
		workspace.id,
		event.params.profileId,
		input
	);
	return json(checked satisfies CheckResponse);
});
