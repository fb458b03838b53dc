import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { orPageError } from '$lib/server/api';
import { mapView } from '$lib/server/maps/views';
import type { PageServerLoad } from './$types';

// The map page's shape (GET /api/workspaces/[ws]/maps/[mapId]) plus which frame of the draft to show.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const view = await orPageError(
		mapView(event.locals.services.db, workspace.id, event.params.mapId, role)
	);
	const frameIndex = Number(event.params.frameIndex);
	if (
		!Number.isInteger(frameIndex) ||
		frameIndex < 0 ||
		frameIndex >= view.map.draft.frames.length
	) {
		error(
			404,
			`This map's draft has no frame ${event.params.frameIndex}; it may have been deleted since.`
		);
	}
	return { ...view, frameIndex };
}) satisfies PageServerLoad;
