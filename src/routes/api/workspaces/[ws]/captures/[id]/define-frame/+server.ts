import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { defineFrameFromCapture } from '$lib/server/captures/define-frame';
import { defineFrameInputSchema } from '$lib/server/captures/view-schemas';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

/** `{ decode, id, extended }` (editor+) → appends an undocumented frame for that ID to the decode's map draft. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { workspace, user } = await requireRole(event, 'editor');
	const input = await readJsonBody(event.request, defineFrameInputSchema);
	return json(
		await defineFrameFromCapture(
			event.locals.services,
			workspace.id,
			event.params.id,
			input,
			user.id
		)
	);
});
