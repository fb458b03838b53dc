import { json } from '@sveltejs/kit';
import type { CaptureStatusResponse } from '$lib/api/captures';
import { apiRoute } from '$lib/server/api';
import { captureStatus } from '$lib/server/captures/captures-db';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const status = await captureStatus(event.locals.services.db, workspace.id, event.params.id);
	return json(status satisfies CaptureStatusResponse);
});
