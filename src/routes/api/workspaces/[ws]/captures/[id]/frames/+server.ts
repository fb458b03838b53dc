import { json } from '@sveltejs/kit';
import { framesQuerySchema, type FramesResponse } from '$lib/api/capture-views';
import { apiRoute, readQuery } from '$lib/server/api';
import { captureFrames } from '$lib/server/captures/frame-views';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** `?offset=&limit=(≤1000)&id=<hex>[&extended=0|1]` → a page of received frames in capture order. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, framesQuerySchema);
	const page = await captureFrames(event.locals.services, workspace.id, event.params.id, query);
	return json(page satisfies FramesResponse);
});
