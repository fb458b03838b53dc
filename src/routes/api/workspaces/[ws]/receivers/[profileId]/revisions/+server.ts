import { json } from '@sveltejs/kit';
import { publishInputSchema } from '$lib/api/maps';
import type { ProfilePublishedResponse, ProfileRevisionListResponse } from '$lib/api/receivers';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { requireProfile } from '$lib/server/receivers/profiles';
import { listProfileRevisions, publishProfile } from '$lib/server/receivers/revisions';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	const profile = await requireProfile(db, workspace.id, event.params.profileId);
	const revisions = await listProfileRevisions(db, profile.id);
	return json({ revisions } satisfies ProfileRevisionListResponse);
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { note, version } = await readJsonBody(event.request, publishInputSchema);
	const revision = await publishProfile(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		version,
		note,
		actorId: user.id
	});
	return json({ revision } satisfies ProfilePublishedResponse, { status: 201 });
});
