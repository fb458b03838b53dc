import { diffPageQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { diffPageView } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

// Without parameters: the latest revision against the draft (or the draft against itself).
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, diffPageQuerySchema);
		const view = await diffPageView(
			event.locals.services.db,
			workspace.id,
			event.params.mapId,
			query
		);
		return { ...view, role };
	});
}) satisfies PageServerLoad;
