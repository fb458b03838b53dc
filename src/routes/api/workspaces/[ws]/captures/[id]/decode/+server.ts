import { json } from '@sveltejs/kit';
import { decodeInputSchema, type DecodeResponse } from '$lib/api/capture-views';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { decodeWith } from '$lib/server/captures/decoding';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** `{ mapId, revision: n | 'draft' }` → decodes the processed capture and records which revision was used. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace, user } = await requireRole(event, 'viewer');
	const input = await readJsonBody(event.request, decodeInputSchema);
	const { decode, summary } = await decodeWith(
		event.locals.services,
		workspace.id,
		event.params.id,
		input,
		user.id
	);
	return json({ decode, summary } satisfies DecodeResponse);
});
