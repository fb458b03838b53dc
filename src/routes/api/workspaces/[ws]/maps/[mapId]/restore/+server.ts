import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { restoreRevision } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { restoreInputSchema } from '$lib/server/map-schemas';
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
	return json({ version: restored.version });
});
