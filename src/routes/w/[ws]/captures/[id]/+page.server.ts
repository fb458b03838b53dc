import { orPageError } from '$lib/server/api';
import { captureDetail } from '$lib/server/captures/captures-db';
import { mapsWithRevisions } from '$lib/server/maps/revisions';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role, user } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => ({
		...(await captureDetail(db, workspace.id, event.params.id)),
		maps: await mapsWithRevisions(db, workspace.id),
		role,
		userEmail: user.email
	}));
}) satisfies PageServerLoad;
