import { orPageError } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { linkDetails } from '$lib/server/receivers/links';
import { profileView } from '$lib/server/receivers/views';
import type { PageServerLoad } from './$types';

// The same shape as GET /api/workspaces/[ws]/receivers/[profileId], plus what the link table shows
// beside the stored links (reasons, candidates) and the linked map revision, for the first paint.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => {
		const view = await profileView(db, workspace.id, event.params.profileId, role);
		const linked = await linkDetails(db, workspace.id, view.profile.draft);
		const relinked = Number(event.url.searchParams.get('relinked'));
		return {
			...view,
			/** Just moved to this map revision by the relink page. */
			relinked: Number.isInteger(relinked) && relinked > 0 ? relinked : null,
			details: linked?.details ?? { reasons: {}, candidates: {} },
			targetMap: linked?.map ?? null
		};
	});
}) satisfies PageServerLoad;
