import { derivedExportQuerySchema } from '$lib/api/workbench';
import { orPageError, readQuery } from '$lib/server/api';
import { exportDerived } from '$lib/server/captures/derived';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** `?decode=…&kind=long|wide&derived=[{name,unit,formula}]`: decoded and derived channels as one CSV. */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, derivedExportQuerySchema);
		return exportDerived(event.locals.services, workspace.id, event.params.id, query);
	});
};
