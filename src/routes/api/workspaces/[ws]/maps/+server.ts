import { json } from '@sveltejs/kit';
import { createMapInputSchema, type CreatedMapResponse, type MapListResponse } from '$lib/api/maps';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { importMap } from '$lib/server/maps/import';
import { listMaps } from '$lib/server/maps/maps';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const maps = await listMaps(event.locals.services.db, workspace.id);
	return json({ maps } satisfies MapListResponse);
});

/** Blank, from map JSON or from the CSV signal table; a bad file is refused whole, with every problem. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const request = await readJsonBody(event.request, createMapInputSchema);
	const created = await importMap(event.locals.services.db, {
		workspaceId: workspace.id,
		actorId: user.id,
		request
	});
	return json(created satisfies CreatedMapResponse, { status: 201 });
});
