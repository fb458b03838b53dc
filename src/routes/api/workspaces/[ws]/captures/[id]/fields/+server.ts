import { json } from '@sveltejs/kit';
import { fieldsQuerySchema, type FieldsResponse } from '$lib/api/field-proposals';
import { apiRoute, readQuery } from '$lib/server/api';
import { fieldProposals } from '$lib/server/captures/field-proposals';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** Proposed fields of the decode's unknown IDs (or of one), computed in a worker and cached. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readQuery(event.url, fieldsQuerySchema);
	const answer = await fieldProposals(event.locals.services, workspace.id, event.params.id, query);
	return json(answer satisfies FieldsResponse);
});
