/**
 * Published revisions of a map: immutable copies of the draft, numbered r1, r2, … Publishing and
 * restoring name the draft version they were made on, like every draft change (`drafts.ts`). The
 * publishing protocol is shared with receiver profiles (`../versioning/revisions.ts`).
 */
import type { RevisionRef, RevisionSummary } from '../../api/maps';
import { lintMap, type LintProblem } from '../../can/lint';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import type { DB } from '../db/connection';
import { personRef } from '../people';
import { Problem } from '../problem';
import { publishDraft, type RevisionStore } from '../versioning/revisions';
import { replaceDraft } from './drafts';
import { readStoredMap, requireMap, type MapRecord } from './maps';

export interface RevisionRecord extends RevisionSummary {
	id: string;
	map: CanMap;
}

function revisionQuery(db: DB, mapId: string) {
	return db
		.selectFrom('map_revisions')
		.leftJoin('User', 'User.id', 'map_revisions.published_by')
		.select([
			'map_revisions.id as id',
			'map_revisions.number as number',
			'map_revisions.note as note',
			'map_revisions.published_at as publishedAt',
			'User.email as email',
			'User.name as userName'
		])
		.where('map_revisions.map_id', '=', mapId);
}

/** Newest first, as a history reads. */
export async function listRevisions(db: DB, mapId: string): Promise<RevisionSummary[]> {
	const rows = await revisionQuery(db, mapId).orderBy('map_revisions.number', 'desc').execute();
	return rows.map((r) => ({
		number: r.number,
		note: r.note,
		publishedAt: r.publishedAt,
		publishedBy: personRef(r.email, r.userName)
	}));
}

/** The revisions of a map in the workspace (404 for a map it does not hold). */
export async function listMapRevisions(
	db: DB,
	workspaceId: string,
	mapId: string
): Promise<RevisionSummary[]> {
	const map = await requireMap(db, workspaceId, mapId);
	return listRevisions(db, map.id);
}

async function findRevision(
	db: DB,
	mapId: string,
	number: number
): Promise<RevisionRecord | undefined> {
	const row = await revisionQuery(db, mapId)
		.select('map_revisions.map_json as mapJson')
		.where('map_revisions.number', '=', number)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		id: row.id,
		number: row.number,
		note: row.note,
		publishedAt: row.publishedAt,
		publishedBy: personRef(row.email, row.userName),
		map: readStoredMap(row.mapJson, `revision r${row.number} of map ${mapId}`)
	};
}

export async function requireRevision(
	db: DB,
	mapId: string,
	number: number
): Promise<RevisionRecord> {
	const revision = await findRevision(db, mapId, number);
	if (!revision) throw new Problem(404, `This map has no revision r${number}.`);
	return revision;
}

/** How maps keep their revisions: rows of `map_revisions` holding the map JSON. */
const mapRevisions: RevisionStore<MapRecord, CanMap> = {
	noun: 'map',
	require: requireMap,
	async lastNumber(db, mapId) {
		const last = await db
			.selectFrom('map_revisions')
			.select((eb) => eb.fn.max('number').as('n'))
			.where('map_id', '=', mapId)
			.executeTakeFirst();
		return Number(last?.n ?? 0);
	},
	async publishedAs(db, mapId, version) {
		const row = await db
			.selectFrom('map_revisions')
			.select('number')
			.where('map_id', '=', mapId)
			.where('draft_version', '=', version)
			.executeTakeFirst();
		return row?.number ?? null;
	},
	async insert(db, r) {
		await db
			.insertInto('map_revisions')
			.values({
				id: r.id,
				map_id: r.parentId,
				number: r.number,
				note: r.note,
				map_json: serializeMap(r.snapshot),
				published_by: r.actorId,
				published_at: r.publishedAt,
				draft_version: r.version
			})
			.execute();
	}
};

/**
 * Publishes the draft as the next revision. The caller names the draft version it reviewed, so a
 * draft changed by someone else in the meantime is never published unseen; lint errors refuse it,
 * and so does a draft version that is already a revision (409).
 */
export async function publishRevision(
	db: DB,
	input: {
		workspaceId: string;
		mapId: string;
		version: number;
		note: string;
		actorId: string;
		now?: Date;
	}
): Promise<RevisionRecord> {
	const { mapId, ...rest } = input;
	const published = await publishDraft(db, mapRevisions, {
		...rest,
		id: mapId,
		action: 'map.publish',
		snapshot: (map) => map.draft,
		refuse: (_map, draft) => {
			const errors = lintMap(draft).filter((p) => p.severity === 'error');
			return errors.length === 0
				? null
				: new Problem(
						422,
						`The draft has ${errors.length} lint error${errors.length === 1 ? '' : 's'}; fix ${errors.length === 1 ? 'it' : 'them'} before publishing.`,
						errors
					);
		}
	});
	const { record: _record, snapshot, ...revision } = published;
	return { ...revision, map: snapshot };
}

/** Copies a revision into the draft (a normal draft change: versioned and audited). */
export async function restoreRevision(
	db: DB,
	input: { workspaceId: string; mapId: string; revision: number; version: number; actorId: string }
): Promise<{ version: number }> {
	await requireMap(db, input.workspaceId, input.mapId);
	const revision = await requireRevision(db, input.mapId, input.revision);
	return replaceDraft(db, {
		workspaceId: input.workspaceId,
		mapId: input.mapId,
		version: input.version,
		draft: revision.map,
		actorId: input.actorId,
		action: 'map.restore',
		details: { revision: revision.number }
	});
}

export interface MapSnapshot {
	map: CanMap;
	/** "r3" or "draft". */
	label: string;
	revision: RevisionSummary | null;
	lint: LintProblem[];
}

/** A map as of a revision or its current draft, for exports, sheets and diffs. */
export async function loadSnapshot(
	db: DB,
	workspaceId: string,
	mapId: string,
	ref: RevisionRef
): Promise<MapSnapshot> {
	if (ref === 'draft') {
		const map = await requireMap(db, workspaceId, mapId);
		return { map: map.draft, label: 'draft', revision: null, lint: lintMap(map.draft) };
	}
	await requireMap(db, workspaceId, mapId);
	const { id: _id, map, ...revision } = await requireRevision(db, mapId, ref);
	return { map, label: `r${ref}`, revision, lint: lintMap(map) };
}

/** Every map of the workspace (by name) with its published revision numbers (newest first), for pickers. */
export async function mapsWithRevisions(
	db: DB,
	workspaceId: string
): Promise<{ id: string; name: string; revisions: number[] }[]> {
	const maps = await db
		.selectFrom('maps')
		.select(['id', 'name'])
		.where('workspace_id', '=', workspaceId)
		.orderBy('name')
		.execute();
	const revisions = await db
		.selectFrom('map_revisions')
		.innerJoin('maps', 'maps.id', 'map_revisions.map_id')
		.select(['map_revisions.map_id as mapId', 'map_revisions.number as number'])
		.where('maps.workspace_id', '=', workspaceId)
		.orderBy('map_revisions.number', 'desc')
		.execute();
	return maps.map((m) => ({
		id: m.id,
		name: m.name,
		revisions: revisions.filter((r) => r.mapId === m.id).map((r) => r.number)
	}));
}
