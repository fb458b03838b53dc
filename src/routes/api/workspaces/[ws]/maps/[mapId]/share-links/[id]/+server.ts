import { apiRoute, noContent } from '$lib/server/api';
import { revokeShareLink } from '$lib/server/maps/share-links';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	await revokeShareLink(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		id: event.params.id,
		actorId: user.id
	});
	return noContent();
});
