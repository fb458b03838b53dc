/**
 * `Authorization: Bearer <token>` as the request pipeline reads it: absent (null), or a credential
 * that was presented — accepted, or not. The guard decides what a credential may do.
 */
import type { DB } from '../db/connection';
import { verifyToken, type TokenGrant } from './tokens';

export type BearerCredential = { ok: true; grant: TokenGrant } | { ok: false };

export async function bearerOf(
	db: DB,
	authorization: string | null,
	now = new Date()
): Promise<BearerCredential | null> {
	if (authorization === null) return null;
	const match = /^Bearer[ \t]+(\S+)[ \t]*$/i.exec(authorization);
	if (!match) return { ok: false };
	const grant = await verifyToken(db, match[1], now);
	return grant ? { ok: true, grant } : { ok: false };
}
