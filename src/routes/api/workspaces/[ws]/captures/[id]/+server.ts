import { json } from '@sveltejs/kit';
import type { CaptureDetail } from '$lib/api/captures';
import { apiRoute, noContent } from '$lib/server/api';
import { captureDetail } from '$lib/server/captures/captures-db';
import { deleteCapture } from '$lib/server/captures/remove';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const detail = await captureDetail(event.locals.services.db, workspace.id, event.params.id);
	return json(detail satisfies CaptureDetail);
});

/** Owners delete any capture; viewers and editors their own uploads (checked in deleteCapture). */
export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace, role } = await requireRole(event, 'viewer');
	await deleteCapture(event.locals.services, {
		workspaceId: workspace.id,
		captureId: event.params.id,
		actorId: user.id,
		role
	});
	return noContent();
});
