import { json } from '@sveltejs/kit';
import type { ProfileView } from '$lib/api/receivers';
import { apiRoute, noContent } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { deleteProfile } from '$lib/server/receivers/profiles';
import { profileView } from '$lib/server/receivers/views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const view = await profileView(
		event.locals.services.db,
		workspace.id,
		event.params.profileId,
		role
	);
	return json(view satisfies ProfileView);
});

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	await deleteProfile(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		actorId: user.id
	});
	return noContent();
});
