import { loadSnapshot } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { orPageError, readRevisionRef } from '$lib/server/map-views';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const ref = readRevisionRef(event.url, 'rev', 'draft');
		const snapshot = await loadSnapshot(
			event.locals.services.db,
			workspace.id,
			event.params.mapId,
			ref
		);
		return {
			map: snapshot.map,
			label: snapshot.label,
			publishedAt: snapshot.revision?.publishedAt ?? null,
			note: snapshot.revision?.note ?? null,
			mapId: event.params.mapId,
			rev: ref
		};
	});
}) satisfies PageServerLoad;
