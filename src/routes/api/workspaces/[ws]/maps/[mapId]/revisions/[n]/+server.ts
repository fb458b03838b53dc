import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { revisionRefSchema, revisionView } from '$lib/server/map-views';
import { Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const ref = revisionRefSchema.safeParse(event.params.n);
	if (!ref.success || ref.data === 'draft')
		throw new Problem(404, `"${event.params.n}" is not a revision number.`);
	return json(
		await revisionView(event.locals.services.db, workspace.id, event.params.mapId, ref.data)
	);
});
