import { orPageError } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { requireMap } from '$lib/server/maps/maps';
import { revisionNumberParam, revisionView } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

// The GET revision shape, plus the map's id and current name for the page's breadcrumbs.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => {
		const map = await requireMap(db, workspace.id, event.params.mapId);
		const view = await revisionView(db, workspace.id, map.id, revisionNumberParam(event.params.n));
		return { ...view, map: { id: map.id, name: map.name }, role };
	});
}) satisfies PageServerLoad;
