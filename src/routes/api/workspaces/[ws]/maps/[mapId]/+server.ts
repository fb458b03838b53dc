import { json } from '@sveltejs/kit';
import { apiRoute, noContent, readJsonBody } from '$lib/server/api';
import { deleteMap, renameMap } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import { renameInputSchema } from '$lib/server/map-schemas';
import { mapView } from '$lib/server/map-views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return json(await mapView(event.locals.services.db, workspace.id, event.params.mapId, role));
});

export const PATCH: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { name, version } = await readJsonBody(event.request, renameInputSchema);
	const renamed = await renameMap(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		name,
		version,
		actorId: user.id
	});
	return json({ map: { id: event.params.mapId, name: renamed.name }, version: renamed.version });
});

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	await deleteMap(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		actorId: user.id
	});
	return noContent();
});
