import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDecodeSummary, type DecodeResponse } from '$lib/server/captures/decoding';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** A recorded decode's summary; re-decoded from the stored frames when it is no longer cached. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const body: DecodeResponse = await getDecodeSummary(
		event.locals.services,
		workspace.id,
		event.params.id,
		event.params.decodeId
	);
	return json(body);
});
