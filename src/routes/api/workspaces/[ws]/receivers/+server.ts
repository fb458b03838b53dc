import { json } from '@sveltejs/kit';
import {
	createProfileInputSchema,
	type CreatedProfileResponse,
	type ProfileListResponse
} from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { createProfile, listProfiles } from '$lib/server/receivers/profiles';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const profiles = await listProfiles(event.locals.services.db, workspace.id);
	return json({ profiles } satisfies ProfileListResponse);
});

/** Blank or from a profile file; a bad file is refused whole, with every problem. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const request = await readJsonBody(event.request, createProfileInputSchema);
	const created = await createProfile(event.locals.services.db, {
		workspaceId: workspace.id,
		actorId: user.id,
		request
	});
	return json(created satisfies CreatedProfileResponse, { status: 201 });
});
