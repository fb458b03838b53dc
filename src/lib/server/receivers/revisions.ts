/**
 * Published revisions of a receiver profile: immutable copies of the draft (profile, links and the
 * map revision they point at), numbered r1, r2, … on the versioning shared with maps
 * (`../versioning/revisions.ts`). A draft linked to a map is only published when every required
 * wanted channel has its link.
 */
import type { RevisionRef, RevisionSummary } from '../../api/maps';
import type { ProfileDraft } from '../../api/receivers';
import { serializeProfile } from '../../can/receivers/profile';
import type { DB } from '../db/connection';
import { personRef } from '../people';
import { Problem } from '../problem';
import { publishDraft, type RevisionStore } from '../versioning/revisions';
import { readStoredLinks, readStoredProfile, requireProfile, type ProfileRecord } from './profiles';

/** What a revision keeps: the draft, and the linked map's name (kept if the map is deleted). */
interface ProfileSnapshotRow {
	draft: ProfileDraft;
	mapName: string | null;
}

const profileRevisions: RevisionStore<ProfileRecord, ProfileSnapshotRow> = {
	noun: 'receiver profile',
	require: requireProfile,
	async lastNumber(db, profileId) {
		const last = await db
			.selectFrom('receiver_profile_revisions')
			.select((eb) => eb.fn.max('number').as('n'))
			.where('profile_id', '=', profileId)
			.executeTakeFirst();
		return Number(last?.n ?? 0);
	},
	async insert(db, r) {
		const { draft, mapName } = r.snapshot;
		await db
			.insertInto('receiver_profile_revisions')
			.values({
				id: r.id,
				profile_id: r.parentId,
				number: r.number,
				note: r.note,
				profile_json: serializeProfile(draft.profile),
				links_json: JSON.stringify(draft.links),
				map_id: draft.target?.mapId ?? null,
				map_name: mapName,
				map_revision: draft.target?.revision ?? null,
				published_by: r.actorId,
				published_at: r.publishedAt
			})
			.execute();
	}
};

/** Required wanted channels a linked draft leaves without a link. */
export function unlinkedRequired(draft: ProfileDraft): string[] {
	const linked = new Set(draft.links.map((l) => l.wanted.toLowerCase()));
	return draft.profile.wanted
		.filter((w) => w.required && !linked.has(w.name.toLowerCase()))
		.map((w) => w.name);
}

export async function publishProfile(
	db: DB,
	input: {
		workspaceId: string;
		profileId: string;
		version: number;
		note: string;
		actorId: string;
		now?: Date;
	}
): Promise<{ number: number }> {
	const published = await publishDraft(db, profileRevisions, {
		workspaceId: input.workspaceId,
		id: input.profileId,
		version: input.version,
		note: input.note,
		actorId: input.actorId,
		now: input.now,
		action: 'receiver.publish',
		snapshot: (record) => ({ draft: record.draft, mapName: record.linkedMapName }),
		refuse: (_record, { draft }) => {
			const missing = unlinkedRequired(draft);
			if (draft.target === null || missing.length === 0) return null;
			return new Problem(
				422,
				`${missing.length} required wanted channel${missing.length === 1 ? ' is' : 's are'} not linked; link ${missing.length === 1 ? 'it' : 'them'} before publishing.`,
				missing.map((name) => ({
					path: `profile.wanted.${draft.profile.wanted.findIndex((w) => w.name === name)}`,
					message: `"${name}" is required and has no link`
				}))
			);
		}
	});
	return { number: published.number };
}

function revisionQuery(db: DB, profileId: string) {
	return db
		.selectFrom('receiver_profile_revisions')
		.leftJoin('User', 'User.id', 'receiver_profile_revisions.published_by')
		.select([
			'receiver_profile_revisions.number as number',
			'receiver_profile_revisions.note as note',
			'receiver_profile_revisions.published_at as publishedAt',
			'User.email as email',
			'User.name as userName'
		])
		.where('receiver_profile_revisions.profile_id', '=', profileId);
}

/** Newest first, as a history reads. */
export async function listProfileRevisions(db: DB, profileId: string): Promise<RevisionSummary[]> {
	const rows = await revisionQuery(db, profileId)
		.orderBy('receiver_profile_revisions.number', 'desc')
		.execute();
	return rows.map((r) => ({
		number: r.number,
		note: r.note,
		publishedAt: r.publishedAt,
		publishedBy: personRef(r.email, r.userName)
	}));
}

/** A profile as of a revision or its draft: what exports, sheets, checks and diffs read. */
export interface ProfileSnapshot {
	/** "r3" or "draft". */
	label: string;
	profileId: string;
	draft: ProfileDraft;
	/** The linked map's name (as published, for a revision); null when not linked. */
	mapName: string | null;
	/** Linked to a map that has since been deleted. */
	mapDeleted: boolean;
	revision: RevisionSummary | null;
}

export async function loadProfileSnapshot(
	db: DB,
	workspaceId: string,
	profileId: string,
	ref: RevisionRef
): Promise<ProfileSnapshot> {
	const record = await requireProfile(db, workspaceId, profileId);
	if (ref === 'draft')
		return {
			label: 'draft',
			profileId: record.id,
			draft: record.draft,
			mapName: record.linkedMapName,
			mapDeleted: record.mapDeleted,
			revision: null
		};
	const row = await revisionQuery(db, record.id)
		.select([
			'receiver_profile_revisions.profile_json as profileJson',
			'receiver_profile_revisions.links_json as linksJson',
			'receiver_profile_revisions.map_id as mapId',
			'receiver_profile_revisions.map_name as mapName',
			'receiver_profile_revisions.map_revision as mapRevision'
		])
		.where('receiver_profile_revisions.number', '=', ref)
		.executeTakeFirst();
	if (!row) throw new Problem(404, `This receiver profile has no revision r${ref}.`);
	const what = `revision r${ref} of profile ${record.id}`;
	const linked = row.mapId !== null && row.mapRevision !== null;
	return {
		label: `r${ref}`,
		profileId: record.id,
		draft: {
			profile: readStoredProfile(row.profileJson, what),
			target: linked ? { mapId: row.mapId!, revision: row.mapRevision! } : null,
			links: linked ? readStoredLinks(row.linksJson, what) : []
		},
		mapName: row.mapName,
		mapDeleted: row.mapId === null && row.mapRevision !== null,
		revision: {
			number: row.number,
			note: row.note,
			publishedAt: row.publishedAt,
			publishedBy: personRef(row.email, row.userName)
		}
	};
}
