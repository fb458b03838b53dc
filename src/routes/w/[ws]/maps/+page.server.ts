import { listMaps } from '$lib/server/maps/maps';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return { maps: await listMaps(event.locals.services.db, workspace.id), role };
}) satisfies PageServerLoad;
