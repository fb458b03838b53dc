import { json } from '@sveltejs/kit';
import { spanQuerySchema, type SpanResponse } from '$lib/api/workbench';
import { apiRoute, readQuery } from '$lib/server/api';
import { measureSpan } from '$lib/server/captures/derived';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Statistics, histogram and XY pairs of a channel (given as a formula) over [from, to]. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, spanQuerySchema);
	const span = await measureSpan(event.locals.services, workspace.id, event.params.id, query);
	return json(span satisfies SpanResponse);
});
