/**
 * Share links: a read-only link to one revision of a map for people outside the workspace. The
 * token is handed out once and only its hash is stored; revoked and expired links stop working.
 */
import { createHash, randomBytes } from 'node:crypto';
import type {
	CreatedShareLinkResponse,
	RevisionSummary,
	ShareLinkStatus,
	ShareLinkView
} from '../../api/maps';
import { sharePath } from '../../api/paths';
import type { CanMap } from '../../can/map';
import type { DB } from '../db/connection';
import { personRef } from '../people';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';
import { readStoredMap, requireMap } from './maps';
import { requireRevision } from './revisions';

function hashShareToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

function statusOf(
	link: { revoked_at: string | null; expires_at: string | null },
	now: Date
): ShareLinkStatus {
	if (link.revoked_at) return 'revoked';
	if (link.expires_at !== null && link.expires_at <= now.toISOString()) return 'expired';
	return 'active';
}

/** The share links of a map in the workspace, newest first. */
export async function listShareLinks(
	db: DB,
	workspaceId: string,
	mapId: string,
	now = new Date()
): Promise<ShareLinkView[]> {
	await requireMap(db, workspaceId, mapId);
	const rows = await db
		.selectFrom('share_links')
		.innerJoin('map_revisions', 'map_revisions.id', 'share_links.revision_id')
		.leftJoin('User', 'User.id', 'share_links.created_by')
		.selectAll('share_links')
		.select(['map_revisions.number as revision', 'User.email as email', 'User.name as userName'])
		.where('share_links.map_id', '=', mapId)
		.orderBy('share_links.created_at', 'desc')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		revision: r.revision,
		createdAt: r.created_at,
		createdBy: personRef(r.email, r.userName),
		expiresAt: r.expires_at,
		revokedAt: r.revoked_at,
		status: statusOf(r, now)
	}));
}

/** Creates a link to one revision; the raw token is returned once and only its hash is stored. */
async function createShareLink(
	db: DB,
	input: {
		workspaceId: string;
		mapId: string;
		revision: number;
		expiresAt: string | null;
		actorId: string;
		now?: Date;
	}
): Promise<{ shareLink: ShareLinkView; token: string }> {
	const now = input.now ?? new Date();
	if (input.expiresAt !== null && input.expiresAt <= now.toISOString()) {
		throw new Problem(400, 'The expiry must be in the future.', [
			{ path: 'expiresAt', message: 'must be a time in the future' }
		]);
	}
	return db.transaction().execute(async (trx) => {
		await requireMap(trx, input.workspaceId, input.mapId);
		const revision = await requireRevision(trx, input.mapId, input.revision);
		const token = randomBytes(24).toString('base64url');
		const row = {
			id: crypto.randomUUID(),
			map_id: input.mapId,
			revision_id: revision.id,
			token_hash: hashShareToken(token),
			created_by: input.actorId,
			created_at: now.toISOString(),
			expires_at: input.expiresAt,
			revoked_at: null
		};
		await trx.insertInto('share_links').values(row).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'share_link.create',
			target: row.id,
			details: { mapId: input.mapId, revision: revision.number, expiresAt: input.expiresAt }
		});
		const creator = await trx
			.selectFrom('User')
			.select(['email', 'name'])
			.where('id', '=', input.actorId)
			.executeTakeFirst();
		return {
			token,
			shareLink: {
				id: row.id,
				revision: revision.number,
				createdAt: row.created_at,
				createdBy: creator ?? null,
				expiresAt: row.expires_at,
				revokedAt: null,
				status: 'active'
			}
		};
	});
}

export async function revokeShareLink(
	db: DB,
	input: { workspaceId: string; mapId: string; id: string; actorId: string; now?: Date }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		await requireMap(trx, input.workspaceId, input.mapId);
		const row = await trx
			.selectFrom('share_links')
			.selectAll()
			.where('id', '=', input.id)
			.where('map_id', '=', input.mapId)
			.executeTakeFirst();
		if (!row) throw new Problem(404, 'No share link with that id on this map.');
		if (row.revoked_at) return; // revoking twice changes nothing
		await trx
			.updateTable('share_links')
			.set({ revoked_at: (input.now ?? new Date()).toISOString() })
			.where('id', '=', row.id)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'share_link.revoke',
			target: row.id,
			details: { mapId: input.mapId }
		});
	});
}

export interface SharedRevision {
	mapName: string;
	workspaceName: string;
	revision: RevisionSummary;
	map: CanMap;
	expiresAt: string | null;
}

/** The revision behind a token, or undefined when it is unknown, revoked or expired (all look the same). */
export async function findSharedRevision(
	db: DB,
	token: string,
	now = new Date()
): Promise<SharedRevision | undefined> {
	const row = await db
		.selectFrom('share_links')
		.innerJoin('map_revisions', 'map_revisions.id', 'share_links.revision_id')
		.innerJoin('maps', 'maps.id', 'share_links.map_id')
		.innerJoin('workspaces', 'workspaces.id', 'maps.workspace_id')
		.leftJoin('User', 'User.id', 'map_revisions.published_by')
		.select([
			'share_links.revoked_at',
			'share_links.expires_at',
			'workspaces.name as workspaceName',
			'map_revisions.number as number',
			'map_revisions.note as note',
			'map_revisions.published_at as publishedAt',
			'map_revisions.map_json as mapJson',
			'User.email as email',
			'User.name as userName'
		])
		.where('share_links.token_hash', '=', hashShareToken(token))
		.executeTakeFirst();
	if (!row || statusOf(row, now) !== 'active') return undefined;
	const map = readStoredMap(row.mapJson, `shared revision r${row.number}`);
	return {
		// The name as published in that revision, like every other export of it.
		mapName: map.name,
		workspaceName: row.workspaceName,
		revision: {
			number: row.number,
			note: row.note,
			publishedAt: row.publishedAt,
			publishedBy: personRef(row.email, row.userName)
		},
		map,
		expiresAt: row.expires_at
	};
}

/**
 * A share link as the API hands it out: the expiry normalised to UTC, and the link's full URL
 * (with its token), which only this answer ever carries.
 */
export async function shareRevision(
	db: DB,
	input: {
		workspaceId: string;
		mapId: string;
		revision: number;
		expiresAt: string | null | undefined;
		actorId: string;
		origin: string;
	}
): Promise<CreatedShareLinkResponse> {
	const { shareLink, token } = await createShareLink(db, {
		...input,
		expiresAt: input.expiresAt ? new Date(input.expiresAt).toISOString() : null
	});
	return { shareLink: { ...shareLink, url: new URL(sharePath(token), input.origin).toString() } };
}
