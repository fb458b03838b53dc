import { json } from '@sveltejs/kit';
import { busLoadQuerySchema, type BusLoadResponse } from '$lib/api/tools';
import { apiRoute, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { plannedBusLoad } from '$lib/server/maps/bus-load';
import type { RequestHandler } from './$types';

/** Planned bus load of one map revision (or its draft), from its frames' cycle times. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, busLoadQuerySchema);
	const answer = await plannedBusLoad(event.locals.services.db, workspace.id, query);
	return json(answer satisfies BusLoadResponse);
});
