import { json } from '@sveltejs/kit';
import { defineFrameInputSchema, type DefinedFrameResponse } from '$lib/api/capture-views';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { defineFrameFromCapture } from '$lib/server/captures/define-frame';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** `{ decode, id, extended }` (editor+) → appends an undocumented frame for that ID to the decode's map draft. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace, user } = await requireRole(event, 'editor');
	const input = await readJsonBody(event.request, defineFrameInputSchema);
	const defined = await defineFrameFromCapture(
		event.locals.services,
		workspace.id,
		event.params.id,
		input,
		user.id
	);
	return json(defined satisfies DefinedFrameResponse);
});
