import { json } from '@sveltejs/kit';
import type { CaptureBusLoadResponse } from '$lib/api/capture-views';
import { apiRoute } from '$lib/server/api';
import { captureBusLoad } from '$lib/server/captures/bus-load';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Bus load per bus at the capture's own bit rate (counted in a capture worker). */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const load = await captureBusLoad(event.locals.services, workspace.id, event.params.id);
	return json(load satisfies CaptureBusLoadResponse);
});
