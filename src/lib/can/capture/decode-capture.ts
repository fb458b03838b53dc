/**
 * Everything the capture screens show, in one call: decoded channels, per-ID statistics, the IDs
 * the map does not define with their bit activity, bus load over time and the J1939 pass.
 */
import type { CompiledMap } from '../decoder';
import { decodeChannels, type Channel } from './channels';
import type { FrameColumns } from './frame-columns';
import { surveyIds, type IdStatistics, type UnknownId } from './id-statistics';
import { scanJ1939, type J1939Scan } from './j1939-scan';
import { loadOverTime, type LoadOverTime } from './load-over-time';

export interface CaptureDecoding {
	frameCount: number;
	/** Seconds from the first to the last frame. */
	duration: number;
	channels: Channel[];
	ids: IdStatistics[];
	unknownIds: UnknownId[];
	busLoad: LoadOverTime;
	/** Present when any extended frame was captured. */
	j1939: J1939Scan | null;
}

export interface DecodeCaptureOptions {
	/** Bit rate for the load figures; the map's bit rate when absent. */
	bitrate?: number;
	/** Bus-load window length in seconds (default 0.1). */
	loadWindowSeconds?: number;
	/** Data-phase bit rate of CAN FD frames; when given, FD frames are taken to switch (BRS). */
	dataBitrate?: number;
}

export function decodeCapture(
	store: FrameColumns,
	compiled: CompiledMap,
	options: DecodeCaptureOptions = {}
): CaptureDecoding {
	const { ids, unknownIds } = surveyIds(store, compiled);
	let first = Infinity;
	let last = -Infinity;
	for (const t of store.time) {
		if (t < first) first = t;
		if (t > last) last = t;
	}
	return {
		frameCount: store.count,
		duration: store.count ? last - first : 0,
		channels: decodeChannels(store, compiled),
		ids,
		unknownIds,
		busLoad: loadOverTime(
			store,
			options.bitrate ?? compiled.map.bitrate,
			options.loadWindowSeconds,
			options.dataBitrate
		),
		j1939: ids.some((s) => s.extended) ? scanJ1939(store) : null
	};
}
