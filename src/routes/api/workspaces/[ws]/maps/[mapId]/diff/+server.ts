import { json } from '@sveltejs/kit';
import { diffMaps } from '$lib/can/map-diff';
import { apiRoute } from '$lib/server/api';
import { loadSnapshot } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { readRevisionRef } from '$lib/server/map-views';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const from = readRevisionRef(event.url, 'from');
	const to = readRevisionRef(event.url, 'to');
	const { db } = event.locals.services;
	const a = await loadSnapshot(db, workspace.id, event.params.mapId, from);
	const b = await loadSnapshot(db, workspace.id, event.params.mapId, to);
	return json({ diff: diffMaps(a.map, b.map), from: a.label, to: b.label });
});
