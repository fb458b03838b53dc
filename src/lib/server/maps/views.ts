/**
 * What the map routes and pages show, built in one place so a page's first paint and a client's
 * later fetch always agree: a map with its lint and revisions, one revision, a diff, a share.
 */
import { error } from '@sveltejs/kit';
import {
	revisionRefSchema,
	type DiffResponse,
	type MapView,
	type RevisionRef,
	type RevisionView
} from '../../api/maps';
import { lintMap } from '../../can/lint';
import { diffMaps } from '../../can/map-diff';
import type { Role } from '../../roles';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { requireMap } from './maps';
import { listRevisions, loadSnapshot, requireRevision } from './revisions';
import { findSharedRevision } from './share-links';

export async function mapView(
	db: DB,
	workspaceId: string,
	mapId: string,
	role: Role
): Promise<MapView> {
	const map = await requireMap(db, workspaceId, mapId);
	return {
		map: {
			id: map.id,
			name: map.name,
			draft: map.draft,
			version: map.version,
			updatedAt: map.updatedAt,
			updatedBy: map.updatedBy
		},
		lint: lintMap(map.draft),
		revisions: await listRevisions(db, map.id),
		role
	};
}

/** The revision number in a `/revisions/[n]` URL (`3` or `r3`); anything else is a 404. */
export function revisionNumberParam(param: string): number {
	const ref = revisionRefSchema.safeParse(param);
	if (!ref.success || ref.data === 'draft')
		throw new Problem(404, `"${param}" is not a revision number.`);
	return ref.data;
}

export async function revisionView(
	db: DB,
	workspaceId: string,
	mapId: string,
	number: number
): Promise<RevisionView> {
	await requireMap(db, workspaceId, mapId);
	const { id: _id, ...revision } = await requireRevision(db, mapId, number);
	return { revision, lint: lintMap(revision.map) };
}

/** Field-by-field differences between two snapshots of a map, with their labels. */
export async function mapDiff(
	db: DB,
	workspaceId: string,
	mapId: string,
	from: RevisionRef,
	to: RevisionRef
): Promise<DiffResponse> {
	const [a, b] = await Promise.all([
		loadSnapshot(db, workspaceId, mapId, from),
		loadSnapshot(db, workspaceId, mapId, to)
	]);
	return { diff: diffMaps(a.map, b.map), from: a.label, to: b.label };
}

/** The diff page: without a `from`, the latest revision (or the draft when there is none) against `to`. */
export async function diffPageView(
	db: DB,
	workspaceId: string,
	mapId: string,
	query: { from?: RevisionRef; to: RevisionRef }
) {
	const map = await requireMap(db, workspaceId, mapId);
	const revisions = await listRevisions(db, map.id);
	const from = query.from ?? revisions[0]?.number ?? 'draft';
	const { diff } = await mapDiff(db, workspaceId, map.id, from, query.to);
	return { diff, from, to: query.to, revisions, map: { id: map.id, name: map.name } };
}

export const SHARE_LINK_GONE = 'This link was revoked or has expired';

/** For the public share pages: unknown, revoked and expired links all get the same 404. */
export async function requireSharedRevision(db: DB, token: string) {
	const shared = await findSharedRevision(db, token);
	if (!shared) error(404, SHARE_LINK_GONE);
	return shared;
}
