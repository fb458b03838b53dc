/**
 * The revision half of versioning, shared by maps and receiver profiles: publishing the reviewed
 * draft version as the next numbered, immutable revision (r1, r2, …) with a note. The caller names
 * the draft version it reviewed, so a draft changed by someone else meanwhile is never published
 * unseen (409); the subject may refuse a draft that is not fit to publish (e.g. 422); the revision
 * and its audit entry are written in one transaction.
 */
import type { PersonRef } from '../../api/shapes';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';
import { staleDraft, type VersionedRecord } from './drafts';

/** How one subject stores its revisions. */
export interface RevisionStore<R extends VersionedRecord, S> {
	noun: string;
	require(db: DB, workspaceId: string, id: string): Promise<R>;
	/** The highest revision number of the record so far, 0 before the first. */
	lastNumber(db: DB, id: string): Promise<number>;
	/**
	 * The revision that already holds this draft version, if the subject remembers versions: a
	 * second publish of one version (a double click, a retried request) is refused with a 409.
	 */
	publishedAs?(db: DB, id: string, version: number): Promise<number | null>;
	insert(
		db: DB,
		revision: {
			id: string;
			parentId: string;
			number: number;
			note: string;
			/** The draft version published. */
			version: number;
			snapshot: S;
			actorId: string;
			publishedAt: string;
		}
	): Promise<void>;
}

export interface PublishedRevision<R, S> {
	id: string;
	number: number;
	note: string;
	publishedAt: string;
	publishedBy: PersonRef | null;
	/** The record as it was published. */
	record: R;
	snapshot: S;
}

export async function publishDraft<R extends VersionedRecord, S>(
	db: DB,
	store: RevisionStore<R, S>,
	input: {
		workspaceId: string;
		id: string;
		/** The draft version the person reviewed. */
		version: number;
		note: string;
		actorId: string;
		/** Audit action, e.g. `map.publish`. */
		action: string;
		/** What the revision keeps of the record's draft. */
		snapshot: (record: R) => S;
		/** Why this draft cannot be published, or null. */
		refuse?: (record: R, snapshot: S) => Problem | null;
		now?: Date;
	}
): Promise<PublishedRevision<R, S>> {
	const publishedAt = (input.now ?? new Date()).toISOString();
	return db.transaction().execute(async (trx) => {
		const record = await store.require(trx, input.workspaceId, input.id);
		if (record.version !== input.version) throw staleDraft(store.noun, record);
		const already = await store.publishedAs?.(trx, record.id, record.version);
		if (already != null) {
			throw new Problem(
				409,
				`This draft version is already published as r${already}; change the draft to publish a new revision.`,
				undefined,
				// The same fields as a stale draft's 409, so one shape describes both refusals.
				{
					currentVersion: record.version,
					updatedAt: record.updatedAt,
					updatedBy: record.updatedBy,
					revision: already
				}
			);
		}
		const snapshot = input.snapshot(record);
		const refusal = input.refuse?.(record, snapshot);
		if (refusal) throw refusal;
		const number = (await store.lastNumber(trx, record.id)) + 1;
		const id = crypto.randomUUID();
		await store.insert(trx, {
			id,
			parentId: record.id,
			number,
			note: input.note,
			version: record.version,
			snapshot,
			actorId: input.actorId,
			publishedAt
		});
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: input.action,
			target: record.id,
			details: { revision: number, version: record.version, note: input.note }
		});
		const publisher = await trx
			.selectFrom('User')
			.select(['email', 'name'])
			.where('id', '=', input.actorId)
			.executeTakeFirst();
		return {
			id,
			number,
			note: input.note,
			publishedAt,
			publishedBy: publisher ?? null,
			record,
			snapshot
		};
	});
}
