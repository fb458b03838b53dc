import { json } from '@sveltejs/kit';
import { diffQuerySchema } from '$lib/api/maps';
import type { ProfileDiffResponse } from '$lib/api/receivers';
import { apiRoute, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { profileDiff } from '$lib/server/receivers/views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { from, to } = readQuery(event.url, diffQuerySchema);
	const diff = await profileDiff(
		event.locals.services.db,
		workspace.id,
		event.params.profileId,
		from,
		to
	);
	return json(diff satisfies ProfileDiffResponse);
});
