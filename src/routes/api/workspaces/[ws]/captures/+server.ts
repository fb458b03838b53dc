import { json } from '@sveltejs/kit';
import {
	uploadQuerySchema,
	type CaptureListResponse,
	type UploadResponse
} from '$lib/api/captures';
import { apiRoute, readQuery } from '$lib/server/api';
import { listCaptures } from '$lib/server/captures/captures-db';
import { readContentLength, receiveCaptureUpload } from '$lib/server/captures/upload';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const captures = await listCaptures(event.locals.services.db, workspace.id);
	return json({ captures } satisfies CaptureListResponse);
});

/** The raw file bytes as the request body (any Content-Type), streamed to storage. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'viewer');
	const { name } = readQuery(event.url, uploadQuerySchema);
	const uploaded = await receiveCaptureUpload(event.locals.services, {
		workspaceId: workspace.id,
		actorId: user.id,
		fileName: name,
		contentLength: readContentLength(event.request.headers),
		body: event.request.body
	});
	return json(uploaded satisfies UploadResponse, { status: 201 });
});
