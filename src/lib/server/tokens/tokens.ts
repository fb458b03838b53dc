/**
 * Access tokens: personal, revocable credentials for scripts and pipelines, each for one workspace
 * with a role no higher than its maker's (read-only = viewer, edit = editor) and an expiry.
 *
 * A token reads `fwt_<id>_<secret>`: the id (8 random bytes, hex) is public and finds the row; the
 * secret (32 random bytes, base64url) is shown once and only its SHA-256 is stored, compared in
 * constant time. 256 random bits need no slow hash: nothing can be guessed from the digest.
 */
import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import { roleAtLeast, type Role, type TokenRole } from '../../roles';
import type { DB } from '../db/connection';
import type { AccessTokenTable } from '../db/schema';
import type { SessionUser } from '../access';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';
import { findMembership } from '../workspaces/members';

/** Active tokens one person may hold in one workspace. */
export const MAX_ACTIVE_TOKENS = 25;

/** Last use is written at most this often per token, and so is its `token.use` audit row. */
export const LAST_USE_INTERVAL_MS = 60_000;

const TOKEN_PATTERN = /^fwt_([0-9a-f]{16})_([A-Za-z0-9_-]{43})$/;

function hashSecret(secret: string): Buffer {
	return createHash('sha256').update(secret).digest();
}

export type TokenStatus = 'active' | 'expired' | 'revoked';

/** A token as its owner sees it in the list (never its secret). */
export interface TokenView {
	id: string;
	name: string;
	role: TokenRole;
	createdAt: string;
	expiresAt: string;
	lastUsedAt: string | null;
	revokedAt: string | null;
	status: TokenStatus;
}

function statusOf(
	row: Pick<AccessTokenTable, 'revoked_at' | 'expires_at'>,
	now: Date
): TokenStatus {
	if (row.revoked_at) return 'revoked';
	return row.expires_at <= now.toISOString() ? 'expired' : 'active';
}

function viewOf(row: AccessTokenTable, now: Date): TokenView {
	return {
		id: row.id,
		name: row.name,
		role: row.role as TokenRole,
		createdAt: row.created_at,
		expiresAt: row.expires_at,
		lastUsedAt: row.last_used_at,
		revokedAt: row.revoked_at,
		status: statusOf(row, now)
	};
}

/** A person's tokens in a workspace: active ones first, then newest first. */
export async function listTokens(
	db: DB,
	input: { workspaceId: string; userId: string; now?: Date }
): Promise<TokenView[]> {
	const now = input.now ?? new Date();
	const rows = await db
		.selectFrom('access_tokens')
		.selectAll()
		.where('workspace_id', '=', input.workspaceId)
		.where('user_id', '=', input.userId)
		.orderBy('created_at', 'desc')
		.execute();
	const views = rows.map((r) => viewOf(r, now));
	return [
		...views.filter((v) => v.status === 'active'),
		...views.filter((v) => v.status !== 'active')
	];
}

/**
 * Makes a token. The role must not exceed the maker's own in the workspace. Returns the token text,
 * which exists nowhere else: only its hash is stored.
 */
export async function createToken(
	db: DB,
	input: {
		workspaceId: string;
		userId: string;
		name: string;
		role: TokenRole;
		expiresInDays: number;
		now?: Date;
	}
): Promise<{ token: string; view: TokenView }> {
	const now = input.now ?? new Date();
	return db.transaction().execute(async (trx) => {
		const membership = await findMembership(trx, input.workspaceId, input.userId);
		if (!membership) throw new Problem(404, 'Workspace not found.');
		if (!roleAtLeast(membership.role, input.role)) {
			throw new Problem(
				403,
				`A token cannot do more than you: your role here is ${membership.role}.`,
				[{ path: 'role', message: 'Choose read-only: your role does not allow editing.' }]
			);
		}
		const active = (await listTokens(trx, { ...input, now })).filter((t) => t.status === 'active');
		if (active.length >= MAX_ACTIVE_TOKENS) {
			throw new Problem(
				409,
				`You already have ${MAX_ACTIVE_TOKENS} active tokens in this workspace. Revoke one you no longer use first.`
			);
		}
		const id = randomBytes(8).toString('hex');
		const secret = randomBytes(32).toString('base64url');
		const row: AccessTokenTable = {
			id,
			workspace_id: input.workspaceId,
			user_id: input.userId,
			name: input.name,
			role: input.role,
			secret_hash: hashSecret(secret).toString('hex'),
			created_at: now.toISOString(),
			expires_at: new Date(now.getTime() + input.expiresInDays * 86_400_000).toISOString(),
			last_used_at: null,
			revoked_at: null
		};
		await trx.insertInto('access_tokens').values(row).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.userId,
			action: 'token.create',
			target: id,
			details: { name: row.name, role: row.role, expiresAt: row.expires_at }
		});
		return { token: `fwt_${id}_${secret}`, view: viewOf(row, now) };
	});
}

/** Revokes one of the person's own tokens (revoking twice changes nothing). */
export async function revokeToken(
	db: DB,
	input: { workspaceId: string; userId: string; id: string; now?: Date }
): Promise<TokenView> {
	const now = input.now ?? new Date();
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.selectFrom('access_tokens')
			.selectAll()
			.where('id', '=', input.id)
			.where('workspace_id', '=', input.workspaceId)
			.where('user_id', '=', input.userId)
			.executeTakeFirst();
		if (!row) throw new Problem(404, 'You have no token with that id in this workspace.');
		if (row.revoked_at) return viewOf(row, now);
		const revoked = { ...row, revoked_at: now.toISOString() };
		await trx
			.updateTable('access_tokens')
			.set({ revoked_at: revoked.revoked_at })
			.where('id', '=', row.id)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.userId,
			action: 'token.revoke',
			target: row.id,
			details: { name: row.name }
		});
		return viewOf(revoked, now);
	});
}

/** What an accepted token lets the guard do: act as its maker, in its workspace, at most at its role. */
export interface TokenGrant {
	id: string;
	name: string;
	workspaceId: string;
	role: TokenRole;
	user: SessionUser;
}

/**
 * The grant of a token text, or undefined when it is malformed, unknown, revoked or expired (all look
 * the same to the caller, so nothing is learnt about other tokens or workspaces).
 */
export async function verifyToken(
	db: DB,
	text: string,
	now = new Date()
): Promise<TokenGrant | undefined> {
	const match = TOKEN_PATTERN.exec(text);
	if (!match) return undefined;
	const [, id, secret] = match;
	const row = await db
		.selectFrom('access_tokens')
		.innerJoin('User', 'User.id', 'access_tokens.user_id')
		.selectAll('access_tokens')
		.select(['User.email as email', 'User.name as userName'])
		.where('access_tokens.id', '=', id)
		.executeTakeFirst();
	if (!row) return undefined;
	const stored = Buffer.from(row.secret_hash, 'hex');
	const given = hashSecret(secret);
	if (stored.length !== given.length || !timingSafeEqual(stored, given)) return undefined;
	if (statusOf(row, now) !== 'active') return undefined;
	return {
		id: row.id,
		name: row.name,
		workspaceId: row.workspace_id,
		role: row.role as TokenRole,
		user: { id: row.user_id, email: row.email, name: row.userName }
	};
}

/**
 * Notes a use of the token: its last use, and a `token.use` audit row naming the request, both at
 * most once a minute per token (a conditional update, so concurrent requests write it once).
 * Changes made with the token are audited on their own rows, each naming the token.
 */
export async function recordTokenUse(
	db: DB,
	grant: TokenGrant,
	request: { method: string; path: string },
	now = new Date()
): Promise<void> {
	const threshold = new Date(now.getTime() - LAST_USE_INTERVAL_MS).toISOString();
	await db.transaction().execute(async (trx) => {
		const result = await trx
			.updateTable('access_tokens')
			.set({ last_used_at: now.toISOString() })
			.where('id', '=', grant.id)
			.where((eb) => eb.or([eb('last_used_at', 'is', null), eb('last_used_at', '<=', threshold)]))
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) === 0) return;
		await appendAudit(trx, {
			workspaceId: grant.workspaceId,
			actorId: grant.user.id,
			action: 'token.use',
			target: grant.id,
			details: { method: request.method, path: request.path },
			tokenId: grant.id
		});
	});
}

/** The lower of a token's role and its maker's current role (a demoted member's tokens follow). */
export function effectiveRole(tokenRole: TokenRole, memberRole: Role): Role {
	return roleAtLeast(memberRole, tokenRole) ? tokenRole : memberRole;
}
