import { json } from '@sveltejs/kit';
import { derivedSeriesQuerySchema, type DerivedSeriesResponse } from '$lib/api/workbench';
import { apiRoute, readQuery } from '$lib/server/api';
import { derivedSeries } from '$lib/server/captures/derived';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** A formula over a decode's channels (docs/derived-channels.md), min/max-decimated to `points`. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, derivedSeriesQuerySchema);
	const series = await derivedSeries(event.locals.services, workspace.id, event.params.id, query);
	return json(series satisfies DerivedSeriesResponse);
});
