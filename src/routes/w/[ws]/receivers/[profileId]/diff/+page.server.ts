import { diffPageQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { profileDiffPage } from '$lib/server/receivers/views';
import type { PageServerLoad } from './$types';

// Without parameters: the latest revision against the draft (or the draft against itself).
export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, diffPageQuerySchema);
		return profileDiffPage(event.locals.services.db, workspace.id, event.params.profileId, query);
	});
}) satisfies PageServerLoad;
