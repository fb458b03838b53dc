import { mapExportQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { exportMap } from '$lib/server/maps/export';
import type { RequestHandler } from './$types';

/** `?rev=<n|draft>&format=json|csv` → a file download naming the map and revision. */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, mapExportQuerySchema);
		return exportMap(event.locals.services.db, workspace.id, event.params.mapId, query);
	});
};
