import { sheetQuerySchema } from '$lib/api/maps';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { loadSnapshot } from '$lib/server/maps/revisions';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const { rev } = readQuery(event.url, sheetQuerySchema);
		const snapshot = await loadSnapshot(
			event.locals.services.db,
			workspace.id,
			event.params.mapId,
			rev
		);
		return {
			map: snapshot.map,
			label: snapshot.label,
			publishedAt: snapshot.revision?.publishedAt ?? null,
			note: snapshot.revision?.note ?? null,
			mapId: event.params.mapId,
			rev
		};
	});
}) satisfies PageServerLoad;
