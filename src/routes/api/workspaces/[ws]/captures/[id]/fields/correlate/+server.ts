import { json } from '@sveltejs/kit';
import { correlateQuerySchema, type CorrelateResponse } from '$lib/api/field-proposals';
import { apiRoute, readQuery } from '$lib/server/api';
import { correlateChannel } from '$lib/server/captures/field-proposals';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Candidate value fields of the unknown IDs ranked against one decoded channel. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, correlateQuerySchema);
	const answer = await correlateChannel(
		event.locals.services,
		workspace.id,
		event.params.id,
		query
	);
	return json(answer satisfies CorrelateResponse);
});
