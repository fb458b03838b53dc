import { json } from '@sveltejs/kit';
import {
	publishInputSchema,
	type PublishedResponse,
	type RevisionListResponse
} from '$lib/api/maps';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { publishAndNotify } from '$lib/server/maps/publish';
import { listMapRevisions } from '$lib/server/maps/revisions';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const revisions = await listMapRevisions(
		event.locals.services.db,
		workspace.id,
		event.params.mapId
	);
	return json({ revisions } satisfies RevisionListResponse);
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const access = await requireRole(event, 'editor');
	const { note, version } = await readJsonBody(event.request, publishInputSchema);
	const published = await publishAndNotify(event.locals.services, access, {
		mapId: event.params.mapId,
		note,
		version,
		origin: event.url.origin
	});
	return json(published satisfies PublishedResponse, { status: 201 });
});
