/**
 * Client for the capture JSON API (contract of issue 5: /api/workspaces/[ws]/captures/…) and the page
 * URLs under /w/[ws]/captures, in one place so links, pages and tests agree.
 * Shapes are the server's own, imported type-only (erased: nothing server-side ships to the browser).
 */
import { requestJson } from '$lib/api/client';
import type { CaptureLayout } from '$lib/can/capture/layout';
import type { CaptureDetail, CaptureSummary, DecodeRecord } from '$lib/server/captures/captures-db';
import type { DecodeSummary } from '$lib/server/captures/decode-summary';
import type { CaptureReport, DetectedLayout } from '$lib/server/captures/schemas';

export type {
	CaptureDetail,
	CaptureSummary,
	DecodeRecord,
	DetectedLayout,
	CaptureReport,
	DecodeSummary
};
export type CaptureStatus = CaptureSummary['status'];
export type ChannelStats = DecodeSummary['channels'][number];
export type IdStats = DecodeSummary['ids'][number];

export interface DecodeAnswer {
	decode: DecodeRecord;
	summary: DecodeSummary;
}

/** What to decode with: a revision number, or the map's working draft. */
export type DecodeRevision = number | 'draft';

export type ExportKind = 'long' | 'wide' | 'frames';

const fallbacks = {
	404: 'That capture, decode or map no longer exists (or you are not a member of the workspace).',
	409: 'That frame is already in the map.'
};

export function capturesApi(slug: string, fetcher: typeof fetch = fetch) {
	const base = `/api/workspaces/${encodeURIComponent(slug)}/captures`;
	const one = (id: string) => `${base}/${encodeURIComponent(id)}`;
	const call = <T>(method: string, url: string, body?: unknown) =>
		requestJson<T>(fetcher, method, url, body, fallbacks);
	return {
		uploadUrl: (fileName: string) => `${base}?name=${encodeURIComponent(fileName)}`,
		list: () => call<{ captures: CaptureSummary[] }>('GET', base),
		get: (id: string) => call<CaptureDetail>('GET', one(id)),
		status: (id: string) =>
			call<{ status: CaptureStatus; progress: number; error: string | null }>(
				'GET',
				`${one(id)}/status`
			),
		process: (id: string, layout: CaptureLayout) =>
			call<{ capture: CaptureSummary }>('POST', `${one(id)}/process`, { layout }),
		decode: (id: string, mapId: string, revision: DecodeRevision) =>
			call<DecodeAnswer>('POST', `${one(id)}/decode`, { mapId, revision }),
		getDecode: (id: string, decodeId: string) =>
			call<DecodeAnswer>('GET', `${one(id)}/decodes/${encodeURIComponent(decodeId)}`),
		remove: (id: string) => call<void>('DELETE', one(id))
	};
}

export type CapturesApi = ReturnType<typeof capturesApi>;

export function capturePaths(slug: string) {
	const list = `/w/${encodeURIComponent(slug)}/captures`;
	const page = (id: string) => `${list}/${encodeURIComponent(id)}`;
	return {
		list,
		page,
		/** The streamed download of a decode (long/wide) or of the raw frames in the canonical layout. */
		exportFile: (
			id: string,
			kind: ExportKind,
			decodeId: string | null,
			wide?: { interval: number; mode: 'last' | 'mean' }
		) => {
			const q = new URLSearchParams({ kind });
			if (decodeId) q.set('decode', decodeId);
			if (kind === 'wide' && wide) {
				q.set('interval', String(wide.interval));
				q.set('mode', wide.mode);
			}
			return `${page(id)}/export?${q}`;
		}
	};
}

/** `r3`, or `draft v7` for a draft decode, as shown next to every decoded figure. */
export function decodeRevisionLabel(d: Pick<DecodeRecord, 'revision' | 'draftVersion'>): string {
	if (d.revision !== null) return `r${d.revision}`;
	return d.draftVersion === null ? 'draft' : `draft (save ${d.draftVersion})`;
}
