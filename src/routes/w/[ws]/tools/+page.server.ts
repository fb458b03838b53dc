import { requireRole } from '$lib/server/guard';
import { mapsWithRevisions } from '$lib/server/maps/revisions';
import type { PageServerLoad } from './$types';

/** The maps and their revision numbers (newest first) the bus-load panel offers. */
export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return { maps: await mapsWithRevisions(event.locals.services.db, workspace.id) };
}) satisfies PageServerLoad;
