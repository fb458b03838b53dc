import { json } from '@sveltejs/kit';
import { MAP_FORMAT, type CanMap } from '$lib/can/map';
import { parseMap } from '$lib/can/map-json';
import { parseSignalTable } from '$lib/can/signal-table-csv';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { createMap, listMaps } from '$lib/server/db/maps';
import { requireRole } from '$lib/server/guard';
import { createMapInputSchema } from '$lib/server/map-schemas';
import { Problem, type Issue } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return json({ maps: await listMaps(event.locals.services.db, workspace.id) });
});

function refused(kind: string, issues: Issue[]): Problem {
	return new Problem(
		400,
		`The ${kind} has ${issues.length} problem${issues.length === 1 ? '' : 's'}; nothing was imported.`,
		issues
	);
}

/** Blank, from map JSON or from the CSV signal table; a bad file is refused whole, with every problem. */
export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const body = await readJsonBody(event.request, createMapInputSchema);
	let map: CanMap;
	let source: 'blank' | 'json' | 'csv' = 'blank';
	if (body.mapJson !== undefined) {
		const parsed = parseMap(body.mapJson);
		if (!parsed.ok)
			throw refused(
				'map file',
				parsed.problems.map((p) => ({ ...p, path: p.path || '(root)' }))
			);
		map = body.name ? { ...parsed.map, name: body.name } : parsed.map;
		source = 'json';
	} else if (body.signalTableCsv !== undefined) {
		const parsed = parseSignalTable(body.signalTableCsv, { name: body.name });
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
		map = parsed.map;
		source = 'csv';
	} else {
		map = { format: MAP_FORMAT, name: body.name!, bitrate: 500_000, frames: [], alertRules: [] };
	}
	const created = await createMap(event.locals.services.db, {
		workspaceId: workspace.id,
		map,
		actorId: user.id,
		source
	});
	return json({ map: created }, { status: 201 });
});
