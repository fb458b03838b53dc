import { loadSnapshot } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { exportResponse } from '$lib/server/map-export';
import { exportFormatSchema } from '$lib/server/map-schemas';
import { orPageError, readRevisionRef } from '$lib/server/map-views';
import { Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/** `?rev=<n|draft>&format=json|csv` → a file download naming the map and revision. */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const ref = readRevisionRef(event.url, 'rev', 'draft');
		const format = exportFormatSchema.safeParse(event.url.searchParams.get('format') ?? 'json');
		if (!format.success) throw new Problem(400, 'The format must be json or csv.');
		const snapshot = await loadSnapshot(
			event.locals.services.db,
			workspace.id,
			event.params.mapId,
			ref
		);
		return exportResponse(snapshot.map, snapshot.label, format.data);
	});
};
