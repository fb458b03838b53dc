// The shapes the map API routes and the server loads share, built in one place so a page's first
// paint and a client's later fetch always agree.
import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { lintMap, type LintProblem } from '$lib/can/lint';
import type { CanMap } from '$lib/can/map';
import type { DB } from './db/connection';
import { requireMap, type PersonRef } from './db/maps';
import {
	listRevisions,
	requireRevision,
	type RevisionRef,
	type RevisionSummary
} from './db/revisions';
import { findSharedRevision } from './db/share-links';
import { Problem } from './problem';
import type { Role } from './roles';

export interface MapView {
	map: {
		id: string;
		name: string;
		draft: CanMap;
		version: number;
		updatedAt: string;
		updatedBy: PersonRef | null;
	};
	lint: LintProblem[];
	revisions: RevisionSummary[];
	role: Role;
}

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

export interface RevisionView {
	revision: RevisionSummary & { map: CanMap };
	lint: LintProblem[];
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

/** `3`, `r3` or `draft` from a URL; anything else is a 400 naming the parameter. */
export const revisionRefSchema = z
	.string()
	.trim()
	.toLowerCase()
	.regex(/^(draft|r?[1-9]\d{0,8})$/, 'must be a revision number like 3 (or r3) or "draft"')
	.transform((s): RevisionRef => (s === 'draft' ? 'draft' : Number(s.replace(/^r/, ''))));

export function readRevisionRef(url: URL, name: string, fallback?: RevisionRef): RevisionRef {
	const raw = url.searchParams.get(name);
	if (raw === null && fallback !== undefined) return fallback;
	const parsed = revisionRefSchema.safeParse(raw ?? '');
	if (!parsed.success) {
		throw new Problem(
			400,
			`The "${name}" parameter ${raw === null ? 'is missing' : 'is not valid'}.`,
			[{ path: name, message: parsed.error.issues[0]?.message ?? 'invalid' }]
		);
	}
	return parsed.data;
}

/** Loads and page endpoints show the error page for an expected failure instead of a 500. */
export async function orPageError<T>(work: Promise<T> | (() => Promise<T>)): Promise<T> {
	try {
		return await (typeof work === 'function' ? work() : work);
	} catch (thrown) {
		if (thrown instanceof Problem) error(thrown.status, thrown.message);
		throw thrown;
	}
}

export const SHARE_LINK_GONE = 'This link was revoked or has expired';

/** For the public share pages: unknown, revoked and expired links all get the same 404. */
export async function requireSharedRevision(db: DB, token: string) {
	const shared = await findSharedRevision(db, token);
	if (!shared) error(404, SHARE_LINK_GONE);
	return shared;
}
