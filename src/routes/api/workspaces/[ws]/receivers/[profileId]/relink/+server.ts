import { json } from '@sveltejs/kit';
import {
	relinkInputSchema,
	relinkQuerySchema,
	type RelinkedResponse,
	type RelinkReview
} from '$lib/api/receivers';
import { apiRoute, readJsonBody, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { applyRelink, relinkReview } from '$lib/server/receivers/relink';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { to } = readQuery(event.url, relinkQuerySchema);
	const review = await relinkReview(
		event.locals.services.db,
		workspace.id,
		event.params.profileId,
		to
	);
	return json(review satisfies RelinkReview);
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const body = await readJsonBody(event.request, relinkInputSchema);
	const relinked = await applyRelink(event.locals.services.db, {
		workspaceId: workspace.id,
		profileId: event.params.profileId,
		...body,
		actorId: user.id
	});
	return json(relinked satisfies RelinkedResponse);
});
