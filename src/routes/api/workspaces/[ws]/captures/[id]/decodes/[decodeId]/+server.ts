import { json } from '@sveltejs/kit';
import type { DecodeResponse } from '$lib/api/capture-views';
import { apiRoute } from '$lib/server/api';
import { getDecodeSummary } from '$lib/server/captures/decoding';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** A recorded decode's summary; re-decoded from the stored frames when it is no longer cached. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const answer = await getDecodeSummary(
		event.locals.services,
		workspace.id,
		event.params.id,
		event.params.decodeId
	);
	return json(answer satisfies DecodeResponse);
});
