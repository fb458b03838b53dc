import { mapExportQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { exportResponse } from '$lib/server/maps/export';
import { requireSharedRevision } from '$lib/server/maps/views';
import type { RequestHandler } from './$types';

/** Anyone holding the link: the shared revision as map JSON or the CSV signal table. */
export const GET: RequestHandler = async (event) => {
	const shared = await requireSharedRevision(event.locals.services.db, event.params.token);
	const { format } = await orPageError(async () =>
		readQuery(event.url, mapExportQuerySchema.pick({ format: true }))
	);
	return exportResponse(shared.map, `r${shared.revision.number}`, format);
};
