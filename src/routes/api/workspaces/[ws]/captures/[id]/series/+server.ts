import { json } from '@sveltejs/kit';
import { seriesQuerySchema, type SeriesResponse } from '$lib/api/capture-views';
import { apiRoute, readQuery } from '$lib/server/api';
import { channelSeries } from '$lib/server/captures/series';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** One channel of a decode over [from, to], min/max-decimated to `points` buckets. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, seriesQuerySchema);
	const series = await channelSeries(event.locals.services, workspace.id, event.params.id, query);
	return json(series satisfies SeriesResponse);
});
