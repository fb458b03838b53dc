import { json } from '@sveltejs/kit';
import { diffQuerySchema, type DiffResponse } from '$lib/api/maps';
import { apiRoute, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { mapDiff } from '$lib/server/maps/views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { from, to } = readQuery(event.url, diffQuerySchema);
	const diff = await mapDiff(event.locals.services.db, workspace.id, event.params.mapId, from, to);
	return json(diff satisfies DiffResponse);
});
