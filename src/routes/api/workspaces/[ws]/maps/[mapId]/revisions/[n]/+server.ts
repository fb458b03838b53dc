import { json } from '@sveltejs/kit';
import type { RevisionView } from '$lib/api/maps';
import { apiRoute } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { revisionNumberParam, revisionView } from '$lib/server/maps/views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const number = revisionNumberParam(event.params.n);
	const view = await revisionView(
		event.locals.services.db,
		workspace.id,
		event.params.mapId,
		number
	);
	return json(view satisfies RevisionView);
});
