/**
 * One decoded channel over [from, to] (the whole capture by default), min/max-decimated to `points`
 * buckets, so a plot gets at most 2 × points values whatever the channel's length (plus one
 * neighbour each side). Answered in the interactive worker pool (work/series.ts): exactly from the
 * channel's chunks for a window with few samples, from its stored pyramid for a wide one.
 */
import type { SeriesQuery, SeriesResponse } from '../../api/capture-views';
import { Problem } from '../problem';
import type { Services } from '../services';
import { openDecode } from './decoding';
import { runCaptureTask } from './pool';
import type { SeriesOutcome } from './work/tasks';

export async function channelSeries(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: SeriesQuery
): Promise<SeriesResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const { summary, channels } = open.stored;
	const info = summary.channels.find((c) => c.index === q.channel);
	if (!info) {
		throw new Problem(
			404,
			`This decode has ${summary.channels.length} channels (0–${summary.channels.length - 1}); there is no channel ${q.channel}.`,
			[{ path: 'channel', message: 'no such channel in this decode' }]
		);
	}
	const from = q.from ?? Math.min(0, q.to ?? 0);
	const to = q.to ?? Math.max(summary.durationS, from);
	const outcome = await runCaptureTask<SeriesOutcome>(
		{
			kind: 'series',
			storage: services.storage.settings,
			indexKey: open.indexKey,
			map: open.map,
			folder: open.folder,
			channel: q.channel,
			from,
			to,
			points: q.points,
			pyramidOffset: channels[q.channel].pyramidOffset,
			pyramidBytes: channels[q.channel].pyramidBytes,
			pyramidPart: channels[q.channel].pyramidPart
		},
		{ interactive: true }
	);
	return {
		channel: {
			index: info.index,
			frameName: info.frameName,
			signalName: info.signalName,
			unit: info.unit
		},
		...outcome
	};
}
