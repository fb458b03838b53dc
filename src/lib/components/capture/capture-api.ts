/**
 * The browser's calls to the capture view routes (series, frames, define-frame), built on the
 * shared requestJson so every failure arrives as an ApiError with a readable message.
 */
import { requestJson } from '$lib/api/client';
// Type-only: the shapes the server routes answer with, defined once beside the code that builds them.
import type { FrameDetail, FrameRow } from '$lib/server/captures/frame-views';

export type { FrameDetail, FrameRow };

/**
 * GET …/captures/[id]/series — one channel, min/max-decimated to the pixels shown (the fields the
 * plot reads of the route's SeriesResponse; null stands for a non-finite float value).
 */
export interface SeriesResponse {
	channel: { index: number; frameName: string; signalName: string; unit: string };
	/** Seconds from the capture's first frame. */
	time: number[];
	value: (number | null)[];
	decimated: boolean;
}

/** GET …/captures/[id]/frames — one page of raw frames in capture order. */
export interface FramesResponse {
	total: number;
	frames: FrameRow[];
}

export interface DefineFrameResponse {
	mapId: string;
	version: number;
	frameIndex: number;
}

const base = (slug: string, captureId: string) =>
	`/api/workspaces/${encodeURIComponent(slug)}/captures/${encodeURIComponent(captureId)}`;

export function fetchSeries(
	slug: string,
	captureId: string,
	query: { decode: string; channel: number; points: number; from?: number; to?: number },
	signal?: AbortSignal
): Promise<SeriesResponse> {
	const params = new URLSearchParams({
		decode: query.decode,
		channel: String(query.channel),
		points: String(query.points)
	});
	if (query.from !== undefined) params.set('from', String(query.from));
	if (query.to !== undefined) params.set('to', String(query.to));
	const fetcher: typeof fetch = (input, init) => fetch(input, { ...init, signal });
	return requestJson<SeriesResponse>(fetcher, 'GET', `${base(slug, captureId)}/series?${params}`);
}

export function fetchFrames(
	slug: string,
	captureId: string,
	query: { offset: number; limit: number; id?: string }
): Promise<FramesResponse> {
	const params = new URLSearchParams({ offset: String(query.offset), limit: String(query.limit) });
	if (query.id) params.set('id', query.id);
	return requestJson<FramesResponse>(fetch, 'GET', `${base(slug, captureId)}/frames?${params}`);
}

export function fetchFrameDetail(
	slug: string,
	captureId: string,
	index: number,
	decodeId: string
): Promise<FrameDetail> {
	return requestJson<FrameDetail>(
		fetch,
		'GET',
		`${base(slug, captureId)}/frames/${index}?decode=${encodeURIComponent(decodeId)}`
	);
}

export function defineFrame(
	slug: string,
	captureId: string,
	body: { decode: string; id: number; extended: boolean }
): Promise<DefineFrameResponse> {
	return requestJson<DefineFrameResponse>(
		fetch,
		'POST',
		`${base(slug, captureId)}/define-frame`,
		body,
		{
			409: 'The map already defines this ID.'
		}
	);
}
