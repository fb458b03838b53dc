import { lintMap } from '$lib/can/lint';
import { requireSharedRevision } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

// Public: anyone holding the link may read this one revision, signed in or not.
export const load = (async (event) => {
	const shared = await requireSharedRevision(event.locals.services.db, event.params.token);
	return { shared, lint: lintMap(shared.map) };
}) satisfies PageServerLoad;
