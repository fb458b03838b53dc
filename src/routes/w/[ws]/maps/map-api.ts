/**
 * Client for the map JSON API (contract in the issue 4 brief: /api/workspaces/[ws]/maps/…).
 * Shapes are the server's own, imported type-only (erased: nothing server-side ships to the browser).
 */
import { ApiError, requestJson } from '$lib/api/client';
import type { LintProblem } from '$lib/can/lint';
import type { CanMapInput } from '$lib/can/map';
import type { MapDiff } from '$lib/can/map-diff';
import type { MapSummary } from '$lib/server/db/maps';
import type { ShareLinkView } from '$lib/server/db/share-links';
import type { MapView, RevisionView } from '$lib/server/map-views';

export type { MapDiff, MapSummary, MapView, RevisionView, ShareLinkView };

/** A revision number, or the working draft. */
export type RevisionRef = number | 'draft';

export type NewMap =
	{ name: string } | { name?: string; mapJson: string } | { name?: string; signalTableCsv: string };

export interface CreatedShareLink {
	id: string;
	url: string;
	revision: number;
	expiresAt: string | null;
}

const fallbacks = {
	404: 'That map, revision or workspace no longer exists (or you are not a member of the workspace).',
	409: 'This map was changed by someone else since you loaded it. Reload to see their changes; your edit was not saved.',
	422: 'The draft has lint errors, so it cannot be published yet.'
};

export function mapsApi(slug: string, fetcher: typeof fetch = fetch) {
	const base = `/api/workspaces/${encodeURIComponent(slug)}/maps`;
	const one = (mapId: string) => `${base}/${encodeURIComponent(mapId)}`;
	const call = <T>(method: string, url: string, body?: unknown) =>
		requestJson<T>(fetcher, method, url, body, fallbacks);
	return {
		list: () => call<{ maps: MapSummary[] }>('GET', base),
		create: (input: NewMap) => call<{ map: { id: string; name: string } }>('POST', base, input),
		get: (mapId: string) => call<MapView>('GET', one(mapId)),
		saveDraft: (mapId: string, version: number, draft: CanMapInput) =>
			call<{ version: number; lint: LintProblem[] }>('PUT', `${one(mapId)}/draft`, {
				version,
				draft
			}),
		rename: (mapId: string, name: string, version: number) =>
			call<unknown>('PATCH', one(mapId), { name, version }),
		remove: (mapId: string) => call<void>('DELETE', one(mapId)),
		publish: (mapId: string, note: string, version: number) =>
			call<{ revision: { number: number } }>('POST', `${one(mapId)}/revisions`, { note, version }),
		revision: (mapId: string, n: number) =>
			call<RevisionView>('GET', `${one(mapId)}/revisions/${n}`),
		diff: (mapId: string, from: RevisionRef, to: RevisionRef) =>
			call<{ diff: MapDiff }>('GET', `${one(mapId)}/diff?from=${from}&to=${to}`),
		restore: (mapId: string, revision: number, version: number) =>
			call<{ version: number }>('POST', `${one(mapId)}/restore`, { revision, version }),
		shareLinks: (mapId: string) =>
			call<{ shareLinks: ShareLinkView[] }>('GET', `${one(mapId)}/share-links`),
		createShareLink: (mapId: string, revision: number, expiresAt: string | null) =>
			call<{ shareLink: CreatedShareLink }>('POST', `${one(mapId)}/share-links`, {
				revision,
				expiresAt
			}),
		revokeShareLink: (mapId: string, id: string) =>
			call<void>('DELETE', `${one(mapId)}/share-links/${encodeURIComponent(id)}`)
	};
}

export type MapsApi = ReturnType<typeof mapsApi>;

/** Page URLs under /w/[ws]/maps, in one place so links and tests agree. */
export function mapPaths(slug: string, mapId: string) {
	const base = `/w/${encodeURIComponent(slug)}/maps/${encodeURIComponent(mapId)}`;
	return {
		map: base,
		frame: (index: number) => `${base}/frames/${index}`,
		revision: (n: number) => `${base}/revisions/${n}`,
		diff: (from: RevisionRef, to: RevisionRef) => `${base}/diff?from=${from}&to=${to}`,
		exportFile: (rev: RevisionRef, format: 'json' | 'csv') =>
			`${base}/export?rev=${rev}&format=${format}`,
		sheet: (rev: RevisionRef) => `${base}/sheet?rev=${rev}`
	};
}

/** `3` or `draft` from a query parameter; null when it is neither. */
export function parseRevisionRef(text: string | null): RevisionRef | null {
	if (text === null) return null;
	const t = text.trim().toLowerCase();
	if (t === 'draft') return 'draft';
	const m = /^r?([1-9]\d{0,8})$/.exec(t);
	return m ? Number(m[1]) : null;
}

export const revisionLabel = (ref: RevisionRef) => (ref === 'draft' ? 'draft' : `r${ref}`);

/** True for the 409 a stale draft save or publish gets; the page offers a reload instead of retrying. */
export function isStale(error: unknown): boolean {
	return error instanceof ApiError && error.status === 409;
}
