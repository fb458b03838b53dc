import { json } from '@sveltejs/kit';
import { acceptFieldsInputSchema, type AcceptedFieldsResponse } from '$lib/api/field-proposals';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { acceptFieldProposals } from '$lib/server/captures/field-proposals';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Accepted proposals (editor+) → a new frame with those signals in a map's draft (409 when stale). */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace, user } = await requireRole(event, 'editor');
	const input = await readJsonBody(event.request, acceptFieldsInputSchema);
	const answer = await acceptFieldProposals(
		event.locals.services,
		workspace.id,
		event.params.id,
		input,
		user.id
	);
	return json(answer satisfies AcceptedFieldsResponse);
});
