/** Planned bus load of one map revision (or its draft), from its frames' cycle times. */
import type { RevisionRef } from '../../api/maps';
import type { BusLoadResponse } from '../../api/tools';
import { mapBusLoad } from '../../can/busload';
import type { DB } from '../db/connection';
import { loadSnapshot } from './revisions';

export async function plannedBusLoad(
	db: DB,
	workspaceId: string,
	query: { mapId: string; rev: RevisionRef; bitrate?: number }
): Promise<BusLoadResponse> {
	const snapshot = await loadSnapshot(db, workspaceId, query.mapId, query.rev);
	return {
		map: { id: query.mapId, name: snapshot.map.name },
		label: snapshot.label,
		busLoad: mapBusLoad(snapshot.map, query.bitrate ?? snapshot.map.bitrate),
		frames: snapshot.map.frames.map((f) => ({
			extended: f.extended,
			length: f.length,
			cycleMs: f.cycleMs
		}))
	};
}
