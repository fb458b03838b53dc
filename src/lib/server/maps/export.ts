/**
 * Map downloads: map JSON (docs/map-format.md), the CSV signal table, or C code for firmware
 * (docs/codegen.md), each naming the revision.
 */
import type { CodegenQuery, ExportFormat, RevisionRef } from '../../api/maps';
import { CODEGEN_VERSION, generateC } from '../../can/codegen/generate';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import { writeSignalTable } from '../../can/signal-table-csv';
import { slugPart } from '../../slug';
import type { DB } from '../db/connection';
import { requireMap } from './maps';
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

/**
 * `<prefix>.h` or `<prefix>.c` of a revision (or the draft, named with its version), from the same
 * generator as the `codegen` command; the header comment names the map, the revision and the
 * generator's version. The output depends only on the map and the prefix, so the two files of one
 * revision always belong together.
 */
export async function exportCode(
	db: DB,
	workspaceId: string,
	mapId: string,
	query: CodegenQuery
): Promise<Response> {
	const snapshot = await loadSnapshot(db, workspaceId, mapId, query.rev);
	const revision =
		query.rev === 'draft'
			? `draft, version ${(await requireMap(db, workspaceId, mapId)).version} (unpublished)`
			: snapshot.label;
	const generated = generateC(snapshot.map, {
		prefix: query.prefix,
		mapName: snapshot.map.name,
		revision,
		generatorVersion: `Framewright codegen ${CODEGEN_VERSION}`
	});
	return new Response(query.file === 'h' ? generated.header : generated.source, {
		headers: {
			'content-type': 'text/x-c; charset=utf-8',
			'content-disposition': `attachment; filename="${query.prefix}.${query.file}"`,
			'x-framewright-revision': snapshot.label,
			'x-framewright-codegen-notes': String(generated.notes.length),
			'cache-control': 'no-store'
		}
	});
}
