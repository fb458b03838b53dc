import { requireSharedRevision } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const shared = await requireSharedRevision(event.locals.services.db, event.params.token);
	return { shared };
}) satisfies PageServerLoad;
