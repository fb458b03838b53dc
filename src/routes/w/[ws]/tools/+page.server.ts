import { listMaps } from '$lib/server/maps/maps';
import { listRevisions } from '$lib/server/maps/revisions';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

/** The maps and their revision numbers (newest first) the bus-load panel offers. */
export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	const maps = await listMaps(db, workspace.id);
	return {
		maps: await Promise.all(
			maps.map(async (m) => ({
				id: m.id,
				name: m.name,
				revisions: (await listRevisions(db, m.id)).map((r) => r.number)
			}))
		)
	};
}) satisfies PageServerLoad;
