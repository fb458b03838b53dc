/**
 * Bus load of a capture of several buses, one figure per bus: a load summed over two buses is no
 * bus's load, so every bus gets its own load-over-time series (same windows for all, so they line
 * up), counted with the capture's own bit rates (docs/capture-csv.md, "Several buses").
 */
import { framesOnBus } from './bus-source';
import type { FrameColumns } from './frame-columns';
import { createLoadCounter, type LoadOverTime } from './load-over-time';

/** Frame columns that may carry each frame's bus (a segment of the chunked store does). */
export type BusColumns = FrameColumns & { readonly bus?: Uint8Array };

export interface BusLoadOfBus {
	bus: number;
	frames: number;
	load: LoadOverTime;
}

/**
 * One load counter per bus, fed segments in capture order. `first`/`last` are the capture's
 * earliest and latest frame times (the chunk index knows them), so every bus has the same windows.
 */
export function createBusLoadCounters(options: {
	busCount: number;
	bitrate: number;
	dataBitrate?: number;
	windowSeconds?: number;
	first: number;
	last: number;
}): { add(columns: BusColumns): void; finish(): BusLoadOfBus[] } {
	const count = Math.max(1, options.busCount);
	const counters = Array.from({ length: count }, () => createLoadCounter(options));
	const frames = new Float64Array(count);
	const add = (columns: BusColumns) => {
		if (!columns.bus || count === 1) {
			counters[0].add(columns);
			frames[0] += columns.count;
			return;
		}
		const seen = new Uint8Array(256);
		for (let i = 0; i < columns.count; i++) seen[columns.bus[i]] = 1;
		for (let b = 0; b < count; b++) {
			if (!seen[b]) continue;
			const own = framesOnBus({ ...columns, bus: columns.bus }, b);
			counters[b].add(own);
			frames[b] += own.count;
		}
	};
	const finish = () => counters.map((c, bus) => ({ bus, frames: frames[bus], load: c.finish() }));
	return { add, finish };
}
