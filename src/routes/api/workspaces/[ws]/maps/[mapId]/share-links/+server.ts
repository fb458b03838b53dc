import { json } from '@sveltejs/kit';
import {
	shareLinkInputSchema,
	type CreatedShareLinkResponse,
	type ShareLinkListResponse
} from '$lib/api/maps';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { listShareLinks, shareRevision } from '$lib/server/maps/share-links';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const shareLinks = await listShareLinks(
		event.locals.services.db,
		workspace.id,
		event.params.mapId
	);
	return json({ shareLinks } satisfies ShareLinkListResponse);
});

/** The URL (with its token) is in this response only; the database keeps a hash. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { revision, expiresAt } = await readJsonBody(event.request, shareLinkInputSchema);
	const created = await shareRevision(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		revision,
		expiresAt,
		actorId: user.id,
		origin: event.url.origin
	});
	return json(created satisfies CreatedShareLinkResponse, { status: 201 });
});
