import { apiRoute, noContent } from '$lib/server/api';
import { deleteSavedView } from '$lib/server/captures/saved-views';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** The view's author deletes it, or an owner (checked in deleteSavedView). */
export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { workspace, user, role } = await requireRole(event, 'viewer');
	await deleteSavedView(event.locals.services.db, {
		workspaceId: workspace.id,
		captureId: event.params.id,
		viewId: event.params.viewId,
		asker: { id: user.id, role }
	});
	return noContent();
});
