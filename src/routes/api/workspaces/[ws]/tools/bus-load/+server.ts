import { json } from '@sveltejs/kit';
import { mapBusLoad } from '$lib/can/busload';
import { apiRoute } from '$lib/server/api';
import { loadSnapshot } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { issuesOf, Problem } from '$lib/server/problem';
import { readBusLoadQuery } from './bus-load-query';
import type { BusLoadResponse } from './bus-load-response';
import type { RequestHandler } from './$types';

/** Planned bus load of one map revision (or its draft), from its frames' cycle times. */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const query = readBusLoadQuery(event.url);
	if (!query.success)
		throw new Problem(400, 'The bus-load query has invalid parameters.', issuesOf(query.error));
	const { mapId, rev, bitrate } = query.data;
	const snapshot = await loadSnapshot(event.locals.services.db, workspace.id, mapId, rev);
	const body: BusLoadResponse = {
		map: { id: mapId, name: snapshot.map.name },
		label: snapshot.label,
		busLoad: mapBusLoad(snapshot.map, bitrate ?? snapshot.map.bitrate),
		frames: snapshot.map.frames.map((f) => ({
			extended: f.extended,
			length: f.length,
			cycleMs: f.cycleMs
		}))
	};
	return json(body);
});
