import { error } from '@sveltejs/kit';
import { lintMap } from '$lib/can/lint';
import { findMapForWorkspace } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const map = await findMapForWorkspace(event.locals.services.db, workspace.id, event.params.mapId);
	if (!map) error(404, 'Map not found in this workspace.');
	const frameIndex = Number(event.params.frameIndex);
	if (!Number.isInteger(frameIndex) || frameIndex < 0 || frameIndex >= map.draft.frames.length) {
		error(404, `This map's draft has no frame ${event.params.frameIndex}; it may have been deleted since.`);
	}
	return {
		map: { id: map.id, name: map.name, draft: map.draft, version: map.version, updatedAt: map.updatedAt },
		lint: lintMap(map.draft),
		frameIndex,
		role
	};
}) satisfies PageServerLoad;
