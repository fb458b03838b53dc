import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireMap } from '$lib/server/db/maps';
import { createShareLink, listShareLinks } from '$lib/server/db/share-links';
import { requireRole } from '$lib/server/guard';
import { shareLinkInputSchema } from '$lib/server/map-schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	const map = await requireMap(db, workspace.id, event.params.mapId);
	return json({ shareLinks: await listShareLinks(db, map.id) });
});

/** The URL (with its token) is in this response only; the database keeps a hash. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { revision, expiresAt } = await readJsonBody(event.request, shareLinkInputSchema);
	const { shareLink, token } = await createShareLink(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		revision,
		expiresAt: expiresAt ? new Date(expiresAt).toISOString() : null,
		actorId: user.id
	});
	const url = new URL(`/s/${token}`, event.url.origin).toString();
	return json({ shareLink: { ...shareLink, url } }, { status: 201 });
});
