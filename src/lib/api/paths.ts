/**
 * Page and download URLs, in one place so links, e-mails, pages and tests agree. Downloads are
 * endpoints of the contract (`endpoints.ts`), so their query strings come from there.
 */
import type { ExportKind } from './capture-views';
import { endpointUrl } from './endpoints';
import type { RevisionRef } from './maps';

const enc = encodeURIComponent;

/** Pages and downloads of one map under /w/[ws]/maps. */
export function mapPaths(slug: string, mapId: string) {
	const base = `/w/${enc(slug)}/maps/${enc(mapId)}`;
	return {
		map: base,
		frame: (index: number) => `${base}/frames/${index}`,
		revision: (n: number) => `${base}/revisions/${n}`,
		diff: (from: RevisionRef, to: RevisionRef) => `${base}/diff?from=${from}&to=${to}`,
		exportFile: (rev: RevisionRef, format: 'json' | 'csv') =>
			endpointUrl('maps.export', { params: { ws: slug, mapId }, query: { rev, format } }),
		sheet: (rev: RevisionRef) => `${base}/sheet?rev=${rev}`,
		/** `<prefix>.h` or `<prefix>.c` generated from a revision or the draft. */
		codeFile: (rev: RevisionRef, file: 'h' | 'c', prefix = 'fw') =>
			endpointUrl('maps.codegen', { params: { ws: slug, mapId }, query: { rev, file, prefix } })
	};
}

/** Pages and downloads of captures under /w/[ws]/captures. */
export function capturePaths(slug: string) {
	const list = `/w/${enc(slug)}/captures`;
	const page = (id: string) => `${list}/${enc(id)}`;
	return {
		list,
		page,
		/** The streamed download of a decode (long/wide) or of the raw frames in the canonical layout. */
		exportFile: (
			id: string,
			kind: ExportKind,
			decodeId: string | null,
			wide?: { interval: number; mode: 'last' | 'mean' }
		) =>
			endpointUrl('captures.export', {
				params: { ws: slug, id },
				query: {
					kind,
					decode: decodeId ?? undefined,
					...(kind === 'wide' && wide ? { interval: wide.interval, mode: wide.mode } : {})
				}
			}),
		/** The decode's channels followed by derived channels (docs/derived-channels.md) as one CSV. */
		exportDerived: (
			id: string,
			kind: 'long' | 'wide',
			decodeId: string,
			derived: { name: string; unit: string; formula: string }[],
			wide?: { interval: number; mode: 'last' | 'mean' }
		) =>
			endpointUrl('captures.exportDerived', {
				params: { ws: slug, id },
				query: {
					kind,
					decode: decodeId,
					derived: JSON.stringify(derived),
					...(kind === 'wide' && wide ? { interval: wide.interval, mode: wide.mode } : {})
				}
			})
	};
}

/** Pages and downloads of one receiver profile under /w/[ws]/receivers. */
export function receiverPaths(slug: string, profileId: string) {
	const list = `/w/${enc(slug)}/receivers`;
	const base = `${list}/${enc(profileId)}`;
	return {
		list,
		profile: base,
		diff: (from: RevisionRef, to: RevisionRef) => `${base}/diff?from=${from}&to=${to}`,
		relink: (to?: number) => `${base}/relink${to ? `?to=${to}` : ''}`,
		check: (rev: RevisionRef = 'draft') => `${base}/check${rev === 'draft' ? '' : `?rev=${rev}`}`,
		sheet: (rev: RevisionRef) => `${base}/sheet?rev=${rev}`,
		exportFile: (rev: RevisionRef, format: 'receive-set' | 'profile') =>
			endpointUrl('receivers.export', {
				params: { ws: slug, profileId },
				query: { rev, format }
			})
	};
}

/** The public page of a share link. */
export const sharePath = (token: string) => `/s/${enc(token)}`;

/** The page where an invited person accepts. */
export const invitationPath = (token: string) => `/invite/${enc(token)}`;
