/**
 * Bus load of a capture of several buses, one figure per bus: a load summed over two buses is no
 * bus's load, so every bus gets its own load-over-time series (same windows for all, so they line
 * up), counted with the capture's own bit rates (docs/capture-csv.md, "Several buses").
 */
import type { FrameColumns } from './frame-columns';
import { createLoadCounter, type LoadOverTime } from './load-over-time';

/** Frame columns that may carry each frame's bus (a segment of the chunked store does). */
export type BusColumns = FrameColumns & { readonly bus?: Uint8Array };

/** The frames of `columns` on bus `bus`, in capture order (a copy; every frame when there is no bus column). */
export function columnsOfBus(columns: BusColumns, bus: number): FrameColumns {
	const buses = columns.bus;
	if (!buses) return columns;
	let n = 0;
	let bytes = 0;
	for (let i = 0; i < columns.count; i++)
		if (buses[i] === bus) {
			n++;
			bytes += columns.length[i];
		}
	if (n === columns.count) return columns;
	const out = {
		count: n,
		time: new Float64Array(n),
		id: new Uint32Array(n),
		flags: new Uint8Array(n),
		length: new Uint8Array(n),
		dataOffset: new Uint32Array(n),
		data: new Uint8Array(bytes)
	};
	for (let i = 0, j = 0, at = 0; i < columns.count; i++) {
		if (buses[i] !== bus) continue;
		out.time[j] = columns.time[i];
		out.id[j] = columns.id[i];
		out.flags[j] = columns.flags[i];
		const len = columns.length[i];
		out.length[j] = len;
		out.dataOffset[j] = at;
		out.data.set(columns.data.subarray(columns.dataOffset[i], columns.dataOffset[i] + len), at);
		at += len;
		j++;
	}
	return out;
}

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
			const own = columnsOfBus(columns, b);
			counters[b].add(own);
			frames[b] += own.count;
		}
	};
	const finish = () => counters.map((c, bus) => ({ bus, frames: frames[bus], load: c.finish() }));
	return { add, finish };
}
