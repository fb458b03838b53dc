import type { DB } from '../db/connection';
import { actingToken } from '../request-context';

export interface AuditEntry {
	workspaceId: string | null;
	actorId: string | null;
	/** Dotted verb, e.g. `workspace.create`, `member.role_change`. */
	action: string;
	target?: string | null;
	details?: Record<string, unknown>;
	/** The access token the change is made with; by default the current request's (request-context.ts). */
	tokenId?: string | null;
}

/**
 * Every mutation appends one row, inside the same transaction as the change it records; a change made
 * with an access token names it.
 */
export async function appendAudit(db: DB, entry: AuditEntry): Promise<void> {
	await db
		.insertInto('audit_log')
		.values({
			workspace_id: entry.workspaceId,
			actor_id: entry.actorId,
			action: entry.action,
			target: entry.target ?? null,
			details: JSON.stringify(entry.details ?? {}),
			created_at: new Date().toISOString(),
			token_id: entry.tokenId === undefined ? actingToken() : entry.tokenId
		})
		.execute();
}
