/**
 * The audit log as a workspace's owners read it: filtered by person, kind and days, newest first,
 * a page at a time (keyset on the entry id, so new entries never shift a page). Each entry comes
 * with the names of what it is about as they are now (a map's or capture's name, a member's),
 * where those still exist.
 */
import { sql, type SelectQueryBuilder } from 'kysely';
import type { PersonRef } from '../../api/shapes';
import type { AuditQuery } from '../../api/workspaces';
import type { DB } from '../db/connection';
import type { Database } from '../db/schema';
import { personRef } from '../people';

export const AUDIT_PAGE_SIZE = 50;

export interface AuditRecord {
	id: number;
	/** Dotted verb, e.g. `map.publish`. */
	action: string;
	createdAt: string;
	actor: PersonRef | null;
	target: string | null;
	details: Record<string, unknown>;
	/** The map the entry is about (its target, or `mapId`/`map` in its details), if it still exists. */
	mapName: string | null;
	/** The member the entry is about (its target is a user), if the account still exists. */
	subject: PersonRef | null;
	/** The capture the entry is about, if it still exists. */
	captureName: string | null;
}

export interface AuditPage {
	entries: AuditRecord[];
	/** The id to page on from: `before` for older entries, `after` for newer; null at either end. */
	older: number | null;
	newer: number | null;
}

function parseDetails(text: string): Record<string, unknown> {
	try {
		const value: unknown = JSON.parse(text);
		return value && typeof value === 'object' ? (value as Record<string, unknown>) : {};
	} catch {
		return {};
	}
}

/** The day after `day` (`2026-12-02` → `2026-12-03`), where a range's last day ends. */
function nextDay(day: string): string {
	const date = new Date(`${day}T00:00:00Z`);
	date.setUTCDate(date.getUTCDate() + 1);
	return date.toISOString().slice(0, 10);
}

type AuditQueryBuilder<O> = SelectQueryBuilder<Database, 'audit_log', O>;

/** The workspace's entries that pass the filter (person, kind, days), any page. */
function filtered<O>(
	query: AuditQueryBuilder<O>,
	workspaceId: string,
	filter: AuditQuery
): AuditQueryBuilder<O> {
	let q = query.where('audit_log.workspace_id', '=', workspaceId);
	if (filter.person) q = q.where('audit_log.actor_id', '=', filter.person);
	if (filter.kind) {
		const kind = filter.kind;
		q = q.where((eb) =>
			eb.or([eb('audit_log.action', '=', kind), eb('audit_log.action', 'like', `${kind}.%`)])
		);
	}
	if (filter.from) q = q.where('audit_log.created_at', '>=', `${filter.from}T00:00:00.000Z`);
	if (filter.to) q = q.where('audit_log.created_at', '<', `${nextDay(filter.to)}T00:00:00.000Z`);
	return q;
}

async function exists(
	db: DB,
	workspaceId: string,
	filter: AuditQuery,
	side: '<' | '>',
	id: number
): Promise<boolean> {
	const row = await filtered(db.selectFrom('audit_log').select('audit_log.id'), workspaceId, filter)
		.where('audit_log.id', side, id)
		.limit(1)
		.executeTakeFirst();
	return row !== undefined;
}

/** One page of the filtered log, newest first. */
export async function readAuditLog(
	db: DB,
	workspaceId: string,
	filter: AuditQuery
): Promise<AuditPage> {
	const newerFirst = filter.after === undefined;
	let query = filtered(
		db
			.selectFrom('audit_log')
			.leftJoin('User as actor', 'actor.id', 'audit_log.actor_id')
			.leftJoin('User as subject', 'subject.id', 'audit_log.target')
			.leftJoin('maps', (join) =>
				join
					.onRef('maps.workspace_id', '=', 'audit_log.workspace_id')
					.on(
						'maps.id',
						'=',
						sql<string>`coalesce(json_extract(audit_log.details, '$.mapId'), json_extract(audit_log.details, '$.map'), audit_log.target)`
					)
			)
			.leftJoin('captures', (join) =>
				join
					.onRef('captures.workspace_id', '=', 'audit_log.workspace_id')
					.onRef('captures.id', '=', 'audit_log.target')
			)
			.select([
				'audit_log.id as id',
				'audit_log.action as action',
				'audit_log.created_at as createdAt',
				'audit_log.target as target',
				'audit_log.details as details',
				'actor.email as actorEmail',
				'actor.name as actorName',
				'subject.email as subjectEmail',
				'subject.name as subjectName',
				'maps.name as mapName',
				'captures.name as captureName'
			]),
		workspaceId,
		filter
	);
	if (filter.before !== undefined) query = query.where('audit_log.id', '<', filter.before);
	if (filter.after !== undefined) query = query.where('audit_log.id', '>', filter.after);
	const rows = await query
		.orderBy('audit_log.id', newerFirst ? 'desc' : 'asc')
		.limit(AUDIT_PAGE_SIZE + 1)
		.execute();
	const more = rows.length > AUDIT_PAGE_SIZE;
	const page = rows.slice(0, AUDIT_PAGE_SIZE);
	if (!newerFirst) page.reverse();
	const entries = page.map((r) => ({
		id: r.id,
		action: r.action,
		createdAt: r.createdAt,
		actor: personRef(r.actorEmail, r.actorName),
		target: r.target,
		details: parseDetails(r.details),
		mapName: r.mapName,
		subject: personRef(r.subjectEmail, r.subjectName),
		captureName: r.captureName
	}));
	const first = entries[0]?.id;
	const last = entries.at(-1)?.id;
	const hasOlder = newerFirst
		? more
		: last !== undefined && (await exists(db, workspaceId, filter, '<', last));
	const hasNewer = newerFirst
		? first !== undefined &&
			filter.before !== undefined &&
			(await exists(db, workspaceId, filter, '>', first))
		: more;
	return {
		entries,
		older: hasOlder && last !== undefined ? last : null,
		newer: hasNewer && first !== undefined ? first : null
	};
}

/** Everyone who can be picked in the person filter: current members and anyone in the log. */
export async function auditPeople(
	db: DB,
	workspaceId: string
): Promise<{ id: string; email: string; name: string | null }[]> {
	return db
		.selectFrom('User')
		.select(['User.id as id', 'User.email as email', 'User.name as name'])
		.where((eb) =>
			eb.or([
				eb(
					'User.id',
					'in',
					eb
						.selectFrom('memberships')
						.select('memberships.user_id')
						.where('memberships.workspace_id', '=', workspaceId)
				),
				eb(
					'User.id',
					'in',
					eb
						.selectFrom('audit_log')
						.select('audit_log.actor_id')
						.where('audit_log.workspace_id', '=', workspaceId)
						.where('audit_log.actor_id', 'is not', null)
				)
			])
		)
		.orderBy('User.name')
		.orderBy('User.email')
		.execute();
}
