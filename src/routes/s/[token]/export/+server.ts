import { error } from '@sveltejs/kit';
import { exportResponse } from '$lib/server/map-export';
import { exportFormatSchema } from '$lib/server/map-schemas';
import { requireSharedRevision } from '$lib/server/map-views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const shared = await requireSharedRevision(event.locals.services.db, event.params.token);
	const format = exportFormatSchema.safeParse(event.url.searchParams.get('format') ?? 'json');
	if (!format.success) error(400, 'The format must be json or csv.');
	return exportResponse(shared.map, `r${shared.revision.number}`, format.data);
};
