/**
 * Repository of receiver profiles: list, find, create (blank or from a `framewright-profile@1`
 * file), delete. Draft changes are in `drafts.ts`, revisions in `revisions.ts`. A profile of
 * another workspace is as unknown as a missing one.
 */
import { sql, type Selectable } from 'kysely';
import { z } from 'zod';
import type {
	CreatedProfileResponse,
	CreateProfileInput,
	ProfileDraft,
	ProfileSummary
} from '../../api/receivers';
import { linkSchema } from '../../can/receivers/link-schema';
import {
	parseProfile,
	PROFILE_FORMAT,
	serializeProfile,
	type ReceiverKind,
	type ReceiverProfile
} from '../../can/receivers/profile';
import type { DB } from '../db/connection';
import type { ReceiverProfileTable } from '../db/schema';
import { personRef } from '../people';
import { Problem } from '../problem';
import type { VersionedRecord } from '../versioning/drafts';
import { appendAudit } from '../workspaces/audit';

export interface ProfileRecord extends VersionedRecord {
	workspaceId: string;
	name: string;
	draft: ProfileDraft;
	/** The linked map's current name (null when not linked or the map is gone). */
	linkedMapName: string | null;
	/** The draft was linked to a map that has since been deleted (its links are dropped). */
	mapDeleted: boolean;
}

const storedLinks = z.array(linkSchema);

/** Stored profiles were validated before they were written, so a parse failure means hand edits. */
export function readStoredProfile(text: string, what: string): ReceiverProfile {
	const parsed = parseProfile(text);
	if (!parsed.ok)
		throw new Error(
			`Stored ${what} is not a valid profile: ${parsed.problems[0]?.path} ${parsed.problems[0]?.message}`
		);
	return parsed.value;
}

export function readStoredLinks(text: string, what: string) {
	const parsed = storedLinks.safeParse(JSON.parse(text));
	if (!parsed.success) throw new Error(`Stored links of ${what} are not valid links`);
	return parsed.data;
}

/** The draft of a row: a link target whose map was deleted leaves the profile unlinked. */
function draftOf(
	row: Pick<
		Selectable<ReceiverProfileTable>,
		'id' | 'draft_json' | 'links_json' | 'map_id' | 'map_revision'
	>
): { draft: ProfileDraft; mapDeleted: boolean } {
	const profile = readStoredProfile(row.draft_json, `draft of profile ${row.id}`);
	const linked = row.map_id !== null && row.map_revision !== null;
	return {
		draft: {
			profile,
			target: linked ? { mapId: row.map_id!, revision: row.map_revision! } : null,
			links: linked ? readStoredLinks(row.links_json, `profile ${row.id}`) : []
		},
		mapDeleted: row.map_id === null && row.map_revision !== null
	};
}

/** The columns a draft is written to. */
export function draftColumns(draft: ProfileDraft) {
	return {
		name: draft.profile.name,
		kind: draft.profile.kind,
		draft_json: serializeProfile(draft.profile),
		links_json: JSON.stringify(draft.links),
		map_id: draft.target?.mapId ?? null,
		map_revision: draft.target?.revision ?? null
	};
}

export async function findProfile(
	db: DB,
	workspaceId: string,
	profileId: string
): Promise<ProfileRecord | undefined> {
	const row = await db
		.selectFrom('receiver_profiles')
		.leftJoin('User', 'User.id', 'receiver_profiles.updated_by')
		.leftJoin('maps', 'maps.id', 'receiver_profiles.map_id')
		.selectAll('receiver_profiles')
		.select(['User.email as email', 'User.name as userName', 'maps.name as mapName'])
		.where('receiver_profiles.id', '=', profileId)
		.where('receiver_profiles.workspace_id', '=', workspaceId)
		.executeTakeFirst();
	if (!row) return undefined;
	return {
		id: row.id,
		workspaceId: row.workspace_id,
		name: row.name,
		...draftOf(row),
		version: row.draft_version,
		updatedAt: row.updated_at,
		updatedBy: personRef(row.email, row.userName),
		linkedMapName: row.mapName
	};
}

export async function requireProfile(
	db: DB,
	workspaceId: string,
	profileId: string
): Promise<ProfileRecord> {
	const profile = await findProfile(db, workspaceId, profileId);
	if (!profile) throw new Problem(404, 'Receiver profile not found in this workspace.');
	return profile;
}

export async function listProfiles(db: DB, workspaceId: string): Promise<ProfileSummary[]> {
	const rows = await db
		.selectFrom('receiver_profiles')
		.leftJoin('User', 'User.id', 'receiver_profiles.updated_by')
		.leftJoin('maps', 'maps.id', 'receiver_profiles.map_id')
		.select((eb) => [
			'receiver_profiles.id as id',
			'receiver_profiles.name as name',
			'receiver_profiles.kind as kind',
			'receiver_profiles.map_id as mapId',
			'receiver_profiles.map_revision as mapRevision',
			'receiver_profiles.updated_at as updatedAt',
			'maps.name as mapName',
			'User.email as email',
			'User.name as userName',
			sql<number>`json_array_length(receiver_profiles.draft_json, '$.wanted')`.as('wantedCount'),
			sql<number>`json_array_length(receiver_profiles.links_json)`.as('linkedCount'),
			eb
				.selectFrom('map_revisions')
				.select((r) => r.fn.max('map_revisions.number').as('n'))
				.whereRef('map_revisions.map_id', '=', 'receiver_profiles.map_id')
				.as('mapLatest'),
			eb
				.selectFrom('receiver_profile_revisions')
				.select((r) => r.fn.max('receiver_profile_revisions.number').as('n'))
				.whereRef('receiver_profile_revisions.profile_id', '=', 'receiver_profiles.id')
				.as('latestRevision')
		])
		.where('receiver_profiles.workspace_id', '=', workspaceId)
		.orderBy('receiver_profiles.updated_at', 'desc')
		.orderBy('receiver_profiles.name')
		.execute();
	return rows.map((r) => {
		const linked = r.mapId !== null && r.mapRevision !== null;
		return {
			id: r.id,
			name: r.name,
			kind: r.kind as ReceiverKind,
			wantedCount: Number(r.wantedCount ?? 0),
			linkedCount: linked ? Number(r.linkedCount ?? 0) : 0,
			map: linked
				? {
						id: r.mapId,
						name: r.mapName ?? '',
						revision: r.mapRevision!,
						latestRevision: r.mapLatest === null ? null : Number(r.mapLatest)
					}
				: null,
			latestRevision: r.latestRevision === null ? null : Number(r.latestRevision),
			updatedAt: r.updatedAt,
			updatedBy: personRef(r.email, r.userName)
		};
	});
}

/** Where a new profile came from (kept in the audit log). */
type ProfileSource = 'blank' | 'json';

/** The profile a create request describes, or a 400 listing every problem of its file. */
function profileFromInput(input: CreateProfileInput): {
	profile: ReceiverProfile;
	source: ProfileSource;
} {
	if (input.profileJson !== undefined) {
		const parsed = parseProfile(input.profileJson);
		if (!parsed.ok)
			throw new Problem(
				400,
				`The profile file has ${parsed.problems.length} problem${parsed.problems.length === 1 ? '' : 's'}; nothing was imported.`,
				parsed.problems.map((p) => ({ ...p, path: p.path || '(root)' }))
			);
		const profile = {
			...parsed.value,
			...(input.name ? { name: input.name } : {}),
			...(input.kind ? { kind: input.kind } : {})
		};
		return { profile, source: 'json' };
	}
	return {
		profile: {
			format: PROFILE_FORMAT,
			name: input.name!, // the contract refuses a blank profile without a name
			kind: input.kind ?? 'display',
			notes: '',
			wanted: [],
			manualLinks: [],
			alertRules: []
		},
		source: 'blank'
	};
}

/** Creates the profile a request describes (audited as `receiver.create` with its source). */
export async function createProfile(
	db: DB,
	input: { workspaceId: string; actorId: string; request: CreateProfileInput; now?: Date }
): Promise<CreatedProfileResponse> {
	const { profile, source } = profileFromInput(input.request);
	const now = (input.now ?? new Date()).toISOString();
	const id = crypto.randomUUID();
	await db.transaction().execute(async (trx) => {
		await trx
			.insertInto('receiver_profiles')
			.values({
				id,
				workspace_id: input.workspaceId,
				...draftColumns({ profile, target: null, links: [] }),
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
			action: 'receiver.create',
			target: id,
			details: { name: profile.name, source, wanted: profile.wanted.length }
		});
	});
	return { profile: { id, name: profile.name } };
}

export async function deleteProfile(
	db: DB,
	input: { workspaceId: string; profileId: string; actorId: string }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const profile = await requireProfile(trx, input.workspaceId, input.profileId);
		// Revisions go with it (ON DELETE CASCADE); the audit trail stays.
		await trx.deleteFrom('receiver_profiles').where('id', '=', profile.id).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'receiver.delete',
			target: profile.id,
			details: { name: profile.name }
		});
	});
}
