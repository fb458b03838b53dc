import { captureDetail, mapsWithRevisions } from '$lib/server/captures/captures-db';
import { requireRole } from '$lib/server/guard';
import { Problem } from '$lib/server/problem';
import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role, user } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	try {
		const detail = await captureDetail(db, workspace.id, event.params.id);
		return {
			...detail,
			maps: await mapsWithRevisions(db, workspace.id),
			role,
			userEmail: user.email
		};
	} catch (thrown) {
		if (thrown instanceof Problem && thrown.status === 404) error(404, thrown.message);
		throw thrown;
	}
}) satisfies PageServerLoad;
