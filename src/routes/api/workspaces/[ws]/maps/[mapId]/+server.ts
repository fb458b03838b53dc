import { json } from '@sveltejs/kit';
import { renameInputSchema, type MapView, type RenamedMapResponse } from '$lib/api/maps';
import { apiRoute, noContent, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { renameMap } from '$lib/server/maps/drafts';
import { deleteMap } from '$lib/server/maps/maps';
import { mapView } from '$lib/server/maps/views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const view = await mapView(event.locals.services.db, workspace.id, event.params.mapId, role);
	return json(view satisfies MapView);
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
	return json(renamed satisfies RenamedMapResponse);
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
