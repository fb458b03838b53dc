import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { requireCaptureRow } from '$lib/server/captures/captures-db';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const row = await requireCaptureRow(event.locals.services.db, workspace.id, event.params.id);
	return json({ status: row.status, progress: row.progress, error: row.error });
});
