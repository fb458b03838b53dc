import { exportQuerySchema } from '$lib/api/capture-views';
import { orPageError, readQuery } from '$lib/server/api';
import { exportCapture } from '$lib/server/captures/export';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/**
 * `?kind=long|wide|frames&decode=<decodeId>&interval=<s>&mode=last|mean` → a streamed CSV download.
 * Decoded exports name the map revision in the file name and in `X-Framewright-Revision`.
 */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, exportQuerySchema);
		return exportCapture(event.locals.services, workspace.id, event.params.id, query);
	});
};
