import { codegenQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { exportCode } from '$lib/server/maps/export';
import type { RequestHandler } from './$types';

/** `?rev=<n|draft>&file=h|c&prefix=fw` → `<prefix>.h` or `<prefix>.c` (docs/codegen.md). */
export const GET: RequestHandler = async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const query = readQuery(event.url, codegenQuerySchema);
		return exportCode(event.locals.services.db, workspace.id, event.params.mapId, query);
	});
};
