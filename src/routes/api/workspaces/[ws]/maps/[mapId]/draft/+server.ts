import { json } from '@sveltejs/kit';
import { draftInputSchema, type DraftSavedResponse } from '$lib/api/maps';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { saveDraft } from '$lib/server/maps/drafts';
import type { RequestHandler } from './$types';

export const PUT: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { version, draft } = await readJsonBody(event.request, draftInputSchema);
	const saved = await saveDraft(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		version,
		draft,
		actorId: user.id
	});
	return json(saved satisfies DraftSavedResponse);
});
