/**
 * Repository of maps: list, find, create, delete. Draft changes are in `drafts.ts`, revisions in
 * `revisions.ts`. A map of another workspace is as unknown as a missing one.
 */
import type { MapSummary } from '../../api/maps';
import type { PersonRef } from '../../api/shapes';
import type { CanMap } from '../../can/map';
import { parseMap, serializeMap } from '../../can/map-json';
import type { DB } from '../db/connection';
import { jsonArrayLength } from '../db/dialect';
import { personRef } from '../people';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';

export interface MapRecord {
	id: string;
	workspaceId: string;
	name: string;
	draft: CanMap;
	version: number;
	updatedAt: string;
	updatedBy: PersonRef | null;
}

/** Where a new map came from (kept in the audit log). */
export type MapSource = 'blank' | 'json' | 'csv';

/** Stored maps are written by serializeMap, so a parse failure means the database was altered by hand. */
export function readStoredMap(text: string, what: string): CanMap {
	const parsed = parseMap(text);
	if (!parsed.ok)
		throw new Error(
			`Stored ${what} is not a valid map: ${parsed.problems[0]?.path} ${parsed.problems[0]?.message}`
		);
	return parsed.map;
}

export async function listMaps(db: DB, workspaceId: string): Promise<MapSummary[]> {
	const rows = await db
		.selectFrom('maps')
		.leftJoin('User', 'User.id', 'maps.updated_by')
		.select((eb) => [
			'maps.id as id',
			'maps.name as name',
			'maps.updated_at as updatedAt',
			'User.email as email',
			'User.name as userName',
			eb
				.selectFrom('map_revisions')
				.select((r) => r.fn.max('map_revisions.number').as('n'))
				.whereRef('map_revisions.map_id', '=', 'maps.id')
				.as('latestRevision'),
			jsonArrayLength(db, 'maps.draft_json', 'frames').as('frameCount')
		])
		.where('maps.workspace_id', '=', workspaceId)
		.orderBy('maps.updated_at', 'desc')
		.orderBy('maps.name')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		updatedAt: r.updatedAt,
		updatedBy: personRef(r.email, r.userName),
		latestRevision: r.latestRevision === null ? null : Number(r.latestRevision),
		frameCount: Number(r.frameCount ?? 0)
	}));
}

/** The map if it belongs to the workspace; a map of another workspace is as unknown as a missing one. */
export async function findMapForWorkspace(
	db: DB,
	workspaceId: string,
	mapId: string
): Promise<MapRecord | undefined> {
	const row = await db
		.selectFrom('maps')
		.leftJoin('User', 'User.id', 'maps.updated_by')
		.selectAll('maps')
		.select(['User.email as email', 'User.name as userName'])
		.where('maps.id', '=', mapId)
		.where('maps.workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		id: row.id,
		workspaceId: row.workspace_id,
		name: row.name,
		draft: readStoredMap(row.draft_json, `draft of map ${row.id}`),
		version: row.draft_version,
		updatedAt: row.updated_at,
		updatedBy: personRef(row.email, row.userName)
	};
}

export async function requireMap(db: DB, workspaceId: string, mapId: string): Promise<MapRecord> {
	const map = await findMapForWorkspace(db, workspaceId, mapId);
	if (!map) throw new Problem(404, 'Map not found in this workspace.');
	return map;
}

export async function createMap(
	db: DB,
	input: {
		workspaceId: string;
		map: CanMap;
		actorId: string;
		source: MapSource;
		now?: Date;
	}
): Promise<{ id: string; name: string }> {
	const now = (input.now ?? new Date()).toISOString();
	const id = crypto.randomUUID();
	await db.transaction().execute(async (trx) => {
		await trx
			.insertInto('maps')
			.values({
				id,
				workspace_id: input.workspaceId,
				name: input.map.name,
				draft_json: serializeMap(input.map),
				draft_version: 1,
				created_by: input.actorId,
				created_at: now,
				updated_by: input.actorId,
				updated_at: now
			})
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'map.create',
			target: id,
			details: { name: input.map.name, source: input.source, frames: input.map.frames.length }
		});
	});
	return { id, name: input.map.name };
}

export async function deleteMap(
	db: DB,
	input: { workspaceId: string; mapId: string; actorId: string }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const map = await requireMap(trx, input.workspaceId, input.mapId);
		// Revisions and share links go with it (ON DELETE CASCADE); the audit trail stays.
		await trx.deleteFrom('maps').where('id', '=', map.id).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'map.delete',
			target: map.id,
			details: { name: map.name }
		});
	});
}
