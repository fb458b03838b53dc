import { diffMaps } from '$lib/can/map-diff';
import { listRevisions, loadSnapshot } from '$lib/server/db/revisions';
import { requireMap } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import { orPageError, readRevisionRef } from '$lib/server/map-views';
import type { PageServerLoad } from './$types';

// Without parameters: the latest revision against the draft (or the draft against itself).
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => {
		const map = await requireMap(db, workspace.id, event.params.mapId);
		const revisions = await listRevisions(db, map.id);
		const latest = revisions[0]?.number ?? 'draft';
		const from = readRevisionRef(event.url, 'from', latest);
		const to = readRevisionRef(event.url, 'to', 'draft');
		const [a, b] = await Promise.all([
			loadSnapshot(db, workspace.id, map.id, from),
			loadSnapshot(db, workspace.id, map.id, to)
		]);
		return {
			diff: diffMaps(a.map, b.map),
			from,
			to,
			revisions,
			map: { id: map.id, name: map.name },
			role
		};
	});
}) satisfies PageServerLoad;
