import { json } from '@sveltejs/kit';
import { saveViewInputSchema, type SavedView, type SavedViewList } from '$lib/api/workbench';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { listSavedViews, saveView } from '$lib/server/captures/saved-views';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace, user, role } = await requireRole(event, 'viewer');
	const list = await listSavedViews(event.locals.services.db, workspace.id, event.params.id, {
		id: user.id,
		role
	});
	return json(list satisfies SavedViewList);
});

/** Viewers may save views of their own. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace, user, role } = await requireRole(event, 'viewer');
	const view = await readJsonBody(event.request, saveViewInputSchema);
	const saved = await saveView(event.locals.services.db, {
		workspaceId: workspace.id,
		captureId: event.params.id,
		asker: { id: user.id, role },
		view
	});
	return json(saved satisfies SavedView, { status: 201 });
});
