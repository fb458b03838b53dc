import { json } from '@sveltejs/kit';
import { linkSuggestionsInputSchema, type LinkSuggestionsResponse } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { suggestLinks } from '$lib/server/receivers/links';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'editor');
	const body = await readJsonBody(event.request, linkSuggestionsInputSchema);
	const suggestions = await suggestLinks(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		...body
	});
	return json(suggestions satisfies LinkSuggestionsResponse);
});
