import { requireMap } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import { orPageError, revisionRefSchema, revisionView } from '$lib/server/map-views';
import { Problem } from '$lib/server/problem';
import type { PageServerLoad } from './$types';

// The GET revision shape, plus the map's id and current name for the page's breadcrumbs.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => {
		const map = await requireMap(db, workspace.id, event.params.mapId);
		const ref = revisionRefSchema.safeParse(event.params.n);
		if (!ref.success || ref.data === 'draft')
			throw new Problem(404, `"${event.params.n}" is not a revision number.`);
		const view = await revisionView(db, workspace.id, map.id, ref.data);
		return { ...view, map: { id: map.id, name: map.name }, role };
	});
}) satisfies PageServerLoad;
