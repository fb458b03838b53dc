/**
 * A capture's bus load per bus at its own bit rates, in a capture worker: one pass over the segments
 * (bus-load-per-bus.ts). Independent of any map, so a new bit rate needs no decode.
 */
import { createBusLoadCounters } from '../../../can/capture/bus-load-per-bus';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import type { BusLoadOutcome, BusLoadTask } from './tasks';

export async function runBusLoad(
	storage: BlobStorage,
	task: Pick<BusLoadTask, 'indexKey' | 'bitrate' | 'dataBitrate'>
): Promise<BusLoadOutcome> {
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const { header } = source.index;
	const counters = createBusLoadCounters({
		busCount: header.buses.length,
		bitrate: task.bitrate,
		dataBitrate: task.dataBitrate ?? undefined,
		first: header.frameCount ? header.minTime : Infinity,
		last: header.frameCount ? header.maxTime : -Infinity
	});
	for (let s = 0; s < source.index.segmentCount; s++)
		counters.add((await source.segment(s)).columns());
	const buses = counters.finish();
	return {
		windowSeconds: buses[0]?.load.windowSeconds ?? 0,
		buses: buses.map((b) => ({
			bus: b.bus,
			name: header.buses[b.bus] ?? '',
			frames: b.frames,
			fdFrames: b.load.fdFrames,
			meanPercent: b.load.meanPercent,
			peakPercent: b.load.peakPercent,
			windows: b.load.windows
		}))
	};
}
