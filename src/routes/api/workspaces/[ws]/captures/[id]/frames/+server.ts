import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { requireReadyCapture } from '$lib/server/captures/decoding';
import { listFrames } from '$lib/server/captures/frame-views';
import { loadFrameStore } from '$lib/server/captures/store';
import { framesQuerySchema, queryObject } from '$lib/server/captures/view-schemas';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/** `?offset=&limit=(≤1000)&id=<hex>[&extended=0|1]` → a page of received frames in capture order. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const q = parseOrProblem(framesQuerySchema, queryObject(event.url));
	const { services } = event.locals;
	const capture = await requireReadyCapture(services, workspace.id, event.params.id);
	return json(listFrames(await loadFrameStore(services, capture), q));
});
