/**
 * A new map: blank, from map JSON (docs/map-format.md) or from the CSV signal table. A file with
 * problems is refused whole, with every problem by JSON path or CSV line, and nothing is stored.
 */
import type { CreateMapInput, CreatedMapResponse } from '../../api/maps';
import type { Issue } from '../../api/problem';
import { canMapSchema, MAP_FORMAT, type CanMap } from '../../can/map';
import { parseMap } from '../../can/map-json';
import { parseSignalTable } from '../../can/signal-table-csv';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { createMap, type MapSource } from './maps';

/** What the map format itself defaults to when a file gives no bit rate. */
const DEFAULT_BITRATE = canMapSchema.shape.bitrate.parse(undefined);

function refused(kind: string, issues: Issue[]): Problem {
	return new Problem(
		400,
		`The ${kind} has ${issues.length} problem${issues.length === 1 ? '' : 's'}; nothing was imported.`,
		issues
	);
}

/** The map a create request describes, or a 400 listing every problem of its file. */
function mapFromInput(input: CreateMapInput): { map: CanMap; source: MapSource } {
	if (input.mapJson !== undefined) {
		const parsed = parseMap(input.mapJson);
		if (!parsed.ok)
			throw refused(
				'map file',
				parsed.problems.map((p) => ({ ...p, path: p.path || '(root)' }))
			);
		return { map: input.name ? { ...parsed.map, name: input.name } : parsed.map, source: 'json' };
	}
	if (input.signalTableCsv !== undefined) {
		const parsed = parseSignalTable(input.signalTableCsv, {
			name: input.name,
			bitrate: input.bitrate
		});
		if (!parsed.ok) {
			throw refused(
				'signal table',
				parsed.problems.map((p) => ({
					path: `line ${p.line}${p.column ? `, column ${p.column}` : ''}`,
					line: p.line,
					column: p.column,
					message: p.message
				}))
			);
		}
		return { map: parsed.map, source: 'csv' };
	}
	// createMapInputSchema refuses a request with neither a file nor a name.
	const name = input.name!;
	return {
		map: {
			format: MAP_FORMAT,
			name,
			bitrate: input.bitrate ?? DEFAULT_BITRATE,
			frames: [],
			alertRules: []
		},
		source: 'blank'
	};
}

/** Creates the map a request describes in the workspace (audited as `map.create` with its source). */
export async function importMap(
	db: DB,
	input: { workspaceId: string; actorId: string; request: CreateMapInput }
): Promise<CreatedMapResponse> {
	const { map, source } = mapFromInput(input.request);
	const created = await createMap(db, {
		workspaceId: input.workspaceId,
		map,
		actorId: input.actorId,
		source
	});
	return { map: created };
}
