/** Map downloads: map JSON (docs/map-format.md) or the CSV signal table, naming the revision. */
import type { ExportFormat, RevisionRef } from '../../api/maps';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import { writeSignalTable } from '../../can/signal-table-csv';
import { slugPart } from '../../slug';
import type { DB } from '../db/connection';
import { loadSnapshot } from './revisions';

/** `club-racer-engine-controller-r2.map.json`: the name and revision travel with the file. */
function exportFileName(mapName: string, label: string, format: ExportFormat): string {
	const base = `${slugPart(mapName, 'map')}-${label}`;
	return format === 'json' ? `${base}.map.json` : `${base}.signals.csv`;
}

/** A download of a map as map JSON or the CSV signal table, stating its revision in name and header. */
export function exportResponse(map: CanMap, label: string, format: ExportFormat): Response {
	const body = format === 'json' ? serializeMap(map) : writeSignalTable(map);
	return new Response(body, {
		headers: {
			'content-type':
				format === 'json' ? 'application/json; charset=utf-8' : 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${exportFileName(map.name, label, format)}"`,
			'x-framewright-revision': label,
			'cache-control': 'no-store'
		}
	});
}

/** A map of the workspace as of a revision (or its draft), as a download. */
export async function exportMap(
	db: DB,
	workspaceId: string,
	mapId: string,
	query: { rev: RevisionRef; format: ExportFormat }
): Promise<Response> {
	const snapshot = await loadSnapshot(db, workspaceId, mapId, query.rev);
	return exportResponse(snapshot.map, snapshot.label, query.format);
}
