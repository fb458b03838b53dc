import { receiverExportQuerySchema } from '$lib/api/receivers';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { exportProfile } from '$lib/server/receivers/export';
import type { RequestHandler } from './$types';

/** `?rev=<n|draft>&format=receive-set|profile` → a file download naming the profile and revision. */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, receiverExportQuerySchema);
		return exportProfile(event.locals.services.db, workspace.id, event.params.profileId, query);
	});
};
