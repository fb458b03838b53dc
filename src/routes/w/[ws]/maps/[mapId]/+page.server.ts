import { requireRole } from '$lib/server/guard';
import { orPageError } from '$lib/server/api';
import { mapView } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

// The same shape as GET /api/workspaces/[ws]/maps/[mapId], for the first paint.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return orPageError(mapView(event.locals.services.db, workspace.id, event.params.mapId, role));
}) satisfies PageServerLoad;
