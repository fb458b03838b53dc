import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { listCaptures } from '$lib/server/captures/captures-db';
import { uploadQuerySchema } from '$lib/server/captures/schemas';
import { receiveCaptureUpload } from '$lib/server/captures/upload';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem, Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return json({ captures: await listCaptures(event.locals.services.db, workspace.id) });
});

/** The raw file bytes as the request body (any Content-Type), streamed to storage. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'viewer');
	const { name } = parseOrProblem(uploadQuerySchema, {
		name: event.url.searchParams.get('name') ?? undefined
	});
	const header = event.request.headers.get('content-length');
	const contentLength = header === null ? null : Number(header);
	if (contentLength !== null && !(Number.isInteger(contentLength) && contentLength >= 0)) {
		throw new Problem(400, 'The Content-Length header is not a byte count.');
	}
	const result = await receiveCaptureUpload(event.locals.services, {
		workspaceId: workspace.id,
		actorId: user.id,
		fileName: name,
		contentLength,
		body: event.request.body
	});
	return json(result, { status: 201 });
});
