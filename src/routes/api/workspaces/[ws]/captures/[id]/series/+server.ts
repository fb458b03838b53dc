import { json } from '@sveltejs/kit';
import { decimateMinMax } from '$lib/can/capture/decimate';
import { apiRoute } from '$lib/server/api';
import { getDecoded } from '$lib/server/captures/decoding';
import { queryObject, seriesQuerySchema } from '$lib/server/captures/view-schemas';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem, Problem } from '$lib/server/problem';
import type { RequestHandler } from './$types';

export interface SeriesResponse {
	channel: { index: number; frameName: string; signalName: string; unit: string };
	/** Seconds from the capture's first frame. */
	time: number[];
	value: (number | null)[];
	/** true when min/max per bucket thinned the samples; false when every sample in the range is here. */
	decimated: boolean;
	/** Samples of the channel inside [from, to]. */
	samplesInRange: number;
}

/**
 * One channel over [from, to] (the whole capture by default), min/max-decimated to `points` buckets,
 * so a plot gets at most 2 × points values whatever the channel's length (plus one neighbour each side).
 */
export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const q = parseOrProblem(seriesQuerySchema, queryObject(event.url));
	const { result } = await getDecoded(
		event.locals.services,
		workspace.id,
		event.params.id,
		q.decode
	);
	const channel = result.channels.find((c) => c.info.index === q.channel);
	if (!channel) {
		throw new Problem(
			404,
			`This decode has ${result.channels.length} channels (0–${result.channels.length - 1}); there is no channel ${q.channel}.`,
			[{ path: 'channel', message: 'no such channel in this decode' }]
		);
	}
	const from = q.from ?? Math.min(0, q.to ?? 0);
	const to = q.to ?? Math.max(result.duration, from);
	const d = decimateMinMax(channel.time, channel.value, from, to, q.points);
	const { info } = channel;
	const body: SeriesResponse = {
		channel: {
			index: info.index,
			frameName: info.frameName,
			signalName: info.signalName,
			unit: info.unit
		},
		time: Array.from(d.time),
		// ±Infinity (a float field can carry it) has no JSON form
		value: Array.from(d.value, (v) => (Number.isFinite(v) ? v : null)),
		decimated: !d.raw,
		samplesInRange: d.inRange
	};
	return json(body);
});
