import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDecoded } from '$lib/server/captures/decoding';
import { frameDetail } from '$lib/server/captures/frame-views';
import { frameDetailQuerySchema } from '$lib/server/captures/view-schemas';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

/** One received frame and its signals as the decode's map reads them (`?decode=<decodeId>`). */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const q = parseOrProblem(frameDetailQuerySchema, {
		index: event.params.index,
		decode: event.url.searchParams.get('decode') ?? undefined
	});
	const { store, compiled } = await getDecoded(
		event.locals.services,
		workspace.id,
		event.params.id,
		q.decode
	);
	return json(frameDetail(store, compiled, q.index));
});
