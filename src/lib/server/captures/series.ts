/**
 * One decoded channel over [from, to] (the whole capture by default), min/max-decimated to `points`
 * buckets, so a plot gets at most 2 × points values whatever the channel's length (plus one
 * neighbour each side).
 */
import type { SeriesQuery, SeriesResponse } from '../../api/capture-views';
import { decimateMinMax } from '../../can/capture/decimate';
import { Problem } from '../problem';
import type { Services } from '../services';
import { getDecoded } from './decoding';

export async function channelSeries(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: SeriesQuery
): Promise<SeriesResponse> {
	const { result } = await getDecoded(services, workspaceId, captureId, q.decode);
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
	return {
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
}
