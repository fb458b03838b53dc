import { json } from '@sveltejs/kit';
import { lintMap } from '$lib/can/lint';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { saveDraft } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import { draftInputSchema } from '$lib/server/map-schemas';
import type { RequestHandler } from './$types';

// A draft may hold lint errors (work in progress); only publishing refuses them.
export const PUT: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { version, draft } = await readJsonBody(event.request, draftInputSchema);
	const saved = await saveDraft(event.locals.services.db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		version,
		draft,
		actorId: user.id
	});
	return json({ version: saved.version, lint: lintMap(draft) });
});
