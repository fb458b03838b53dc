import { json } from '@sveltejs/kit';
import { manualLinkInputSchema, type ManualLinkResponse } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { manualLink } from '$lib/server/receivers/links';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'editor');
	const body = await readJsonBody(event.request, manualLinkInputSchema);
	const linked = await manualLink(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		...body
	});
	return json(linked satisfies ManualLinkResponse);
});
