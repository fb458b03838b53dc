/**
 * What the receiver routes and pages show, built in one place so a page's first paint and a
 * client's later fetch agree: a profile with its revisions and link target, and a diff.
 */
import type { RevisionRef } from '../../api/maps';
import type { LinkedMap, ProfileDiffResponse, ProfileView } from '../../api/receivers';
import { diffProfiles } from '../../can/receivers/profile-diff';
import type { Role } from '../../roles';
import type { DB } from '../db/connection';
import { mapsWithRevisions } from '../maps/revisions';
import { requireProfile } from './profiles';
import { listProfileRevisions, loadProfileSnapshot, type ProfileSnapshot } from './revisions';

/** The map revision a draft is linked to, with the map's newest revision (to offer a relink). */
async function linkedMap(
	db: DB,
	target: { mapId: string; revision: number } | null,
	mapName: string | null
): Promise<LinkedMap | null> {
	if (!target) return null;
	const latest = await db
		.selectFrom('map_revisions')
		.select((eb) => eb.fn.max('number').as('n'))
		.where('map_id', '=', target.mapId)
		.executeTakeFirst();
	return {
		id: target.mapId,
		name: mapName ?? '',
		revision: target.revision,
		latestRevision: latest?.n === null || latest?.n === undefined ? null : Number(latest.n)
	};
}

export async function profileView(
	db: DB,
	workspaceId: string,
	profileId: string,
	role: Role
): Promise<ProfileView> {
	const record = await requireProfile(db, workspaceId, profileId);
	return {
		profile: {
			id: record.id,
			name: record.name,
			draft: record.draft,
			version: record.version,
			updatedAt: record.updatedAt,
			updatedBy: record.updatedBy
		},
		linkedMap: await linkedMap(db, record.draft.target, record.linkedMapName),
		mapDeleted: record.mapDeleted,
		revisions: await listProfileRevisions(db, record.id),
		maps: (await mapsWithRevisions(db, workspaceId)).filter((m) => m.revisions.length > 0),
		role
	};
}

const linkedTo = (s: ProfileSnapshot) =>
	s.draft.target ? `${s.mapName ?? 'a deleted map'} r${s.draft.target.revision}` : null;

/** Field-by-field differences between two snapshots of a profile, with their labels. */
export async function profileDiff(
	db: DB,
	workspaceId: string,
	profileId: string,
	from: RevisionRef,
	to: RevisionRef
): Promise<ProfileDiffResponse> {
	const [a, b] = await Promise.all([
		loadProfileSnapshot(db, workspaceId, profileId, from),
		loadProfileSnapshot(db, workspaceId, profileId, to)
	]);
	const snapshot = (s: ProfileSnapshot) => ({
		profile: s.draft.profile,
		links: s.draft.links,
		linkedTo: linkedTo(s)
	});
	return { diff: diffProfiles(snapshot(a), snapshot(b)), from: a.label, to: b.label };
}

/** The diff page: without a `from`, the latest revision (or the draft when there is none) against `to`. */
export async function profileDiffPage(
	db: DB,
	workspaceId: string,
	profileId: string,
	query: { from?: RevisionRef; to: RevisionRef }
) {
	const record = await requireProfile(db, workspaceId, profileId);
	const revisions = await listProfileRevisions(db, record.id);
	const from = query.from ?? revisions[0]?.number ?? 'draft';
	const { diff } = await profileDiff(db, workspaceId, record.id, from, query.to);
	return { diff, from, to: query.to, revisions, profile: { id: record.id, name: record.name } };
}
