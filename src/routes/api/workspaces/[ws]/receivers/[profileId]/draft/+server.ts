import { json } from '@sveltejs/kit';
import { profileDraftInputSchema, type ProfileDraftSavedResponse } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { saveProfileDraft } from '$lib/server/receivers/drafts';
import type { RequestHandler } from './$types';

export const PUT: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { version, draft } = await readJsonBody(event.request, profileDraftInputSchema);
	const saved = await saveProfileDraft(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		version,
		draft,
		actorId: user.id
	});
	return json(saved satisfies ProfileDraftSavedResponse);
});
