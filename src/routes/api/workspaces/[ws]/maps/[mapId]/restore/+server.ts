import { json } from '@sveltejs/kit';
import { restoreInputSchema, type VersionResponse } from '$lib/api/maps';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { restoreRevision } from '$lib/server/maps/revisions';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { revision, version } = await readJsonBody(event.request, restoreInputSchema);
	const restored = await restoreRevision(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		revision,
		version,
		actorId: user.id
	});
	return json(restored satisfies VersionResponse);
});
