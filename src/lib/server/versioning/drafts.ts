/**
 * The draft half of versioning, shared by every subject that keeps an editable draft with published
 * revisions (maps, receiver profiles): a change names the draft version it was made on, and a change
 * made on an older version is refused with a 409 saying who changed it and when — never overwritten.
 * Each change is audited in the same transaction. The subject supplies its own reads and writes
 * (`DraftStore`); the protocol lives here once.
 */
import type { PersonRef } from '../../api/shapes';
import type { DB } from '../db/connection';
import { personLabel } from '../people';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';

/** What every versioned record tells about its draft. */
export interface VersionedRecord {
	id: string;
	/** Bumped by every change to the draft. */
	version: number;
	updatedAt: string;
	updatedBy: PersonRef | null;
}

/** How one subject reads and writes its drafts. */
export interface DraftStore<R extends VersionedRecord, D> {
	/** The subject in messages: "map", "receiver profile". */
	noun: string;
	/** The record if the workspace holds it; a 404 Problem otherwise. */
	require(db: DB, workspaceId: string, id: string): Promise<R>;
	/**
	 * Writes `draft` as version `next`, only where the stored version is still `expected` (the
	 * condition is part of the UPDATE, so two racing saves cannot both succeed). True when written.
	 */
	write(
		db: DB,
		change: { id: string; expected: number; next: number; draft: D; actorId: string; at: string }
	): Promise<boolean>;
}

/** The 409 of a change made on a version someone else has replaced, naming who and when. */
export function staleDraft(noun: string, current: VersionedRecord): Problem {
	return new Problem(
		409,
		`This ${noun} was changed by ${personLabel(current.updatedBy)} at ${current.updatedAt} since you loaded it. Reload to see their changes; your edit was not saved.`,
		undefined,
		{ currentVersion: current.version, updatedAt: current.updatedAt, updatedBy: current.updatedBy }
	);
}

/**
 * Replaces the draft only if nobody changed it since `version` was read, and audits the change
 * as `action` with the new version in its details.
 */
export async function replaceDraft<R extends VersionedRecord, D>(
	db: DB,
	store: DraftStore<R, D>,
	input: {
		workspaceId: string;
		id: string;
		version: number;
		draft: D;
		actorId: string;
		action: string;
		details?: Record<string, unknown>;
	}
): Promise<{ version: number }> {
	return db.transaction().execute(async (trx) => {
		const current = await store.require(trx, input.workspaceId, input.id);
		const next = input.version + 1;
		const written = await store.write(trx, {
			id: input.id,
			expected: input.version,
			next,
			draft: input.draft,
			actorId: input.actorId,
			at: new Date().toISOString()
		});
		if (!written) throw staleDraft(store.noun, current);
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: input.action,
			target: input.id,
			details: { version: next, ...input.details }
		});
		return { version: next };
	});
}
