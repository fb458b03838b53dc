import { json } from '@sveltejs/kit';
import { frameDetailQuerySchema, type FrameDetail } from '$lib/api/capture-views';
import { apiRoute, queryObject } from '$lib/server/api';
import { decodedFrame } from '$lib/server/captures/frame-views';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/** One received frame and its signals as the decode's map reads them (`?decode=<decodeId>`). */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = parseOrProblem(frameDetailQuerySchema, {
		...queryObject(event.url),
		index: event.params.index
	});
	const detail = await decodedFrame(event.locals.services, workspace.id, event.params.id, query);
	return json(detail satisfies FrameDetail);
});
