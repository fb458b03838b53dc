import { listCaptures } from '$lib/server/captures/captures-db';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role, user } = await requireRole(event, 'viewer');
	return {
		captures: await listCaptures(event.locals.services.db, workspace.id),
		role,
		userEmail: user.email
	};
}) satisfies PageServerLoad;
