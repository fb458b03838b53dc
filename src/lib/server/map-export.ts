import type { CanMap } from '$lib/can/map';
import { serializeMap } from '$lib/can/map-json';
import { writeSignalTable } from '$lib/can/signal-table-csv';
import { slugify } from './db/workspaces';
import type { ExportFormat } from './map-schemas';

/** `club-racer-engine-controller-r2.map.json`: the name and revision travel with the file. */
export function exportFileName(mapName: string, label: string, format: ExportFormat): string {
	const base = `${slugify(mapName).replace(/^workspace$/, 'map')}-${label}`;
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
