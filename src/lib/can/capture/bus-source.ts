/**
 * One bus of a stored capture of several, as a ChunkSource of its own (docs/capture-csv.md,
 * "Several buses"): every segment and chunk read through it holds only that bus's frames, so a
 * decode, its channel series, alerts and exports of "one chosen bus" run the same passes as an
 * all-bus decode. The index stays the capture's (times, identifiers and chunk table), so the time
 * axis of a one-bus decode is the capture's.
 */
import type { ChunkSource } from './chunked-decode';
import type { FrameColumns } from './frame-columns';

type Columns = ReturnType<Awaited<ReturnType<ChunkSource['segment']>>['columns']>;

/** Frame columns with each frame's bus, and the other small columns when the source has them. */
export type BusFrameColumns = FrameColumns & {
	readonly bus: Uint8Array;
	readonly kind?: Uint8Array;
	readonly direction?: Uint8Array;
	readonly tag?: Uint16Array;
};

/** The frames of `c` on bus `bus`, every column kept, in capture order (c itself when all are). */
export function framesOnBus<T extends BusFrameColumns>(c: T, bus: number): T {
	let n = 0;
	let bytes = 0;
	for (let i = 0; i < c.count; i++)
		if (c.bus[i] === bus) {
			n++;
			bytes += c.length[i];
		}
	if (n === c.count) return c;
	const out = {
		count: n,
		time: new Float64Array(n),
		id: new Uint32Array(n),
		flags: new Uint8Array(n),
		length: new Uint8Array(n),
		dataOffset: new Uint32Array(n),
		data: new Uint8Array(bytes),
		bus: new Uint8Array(n).fill(bus),
		...(c.kind ? { kind: new Uint8Array(n) } : {}),
		...(c.direction ? { direction: new Uint8Array(n) } : {}),
		...(c.tag ? { tag: new Uint16Array(n) } : {})
	};
	for (let i = 0, j = 0, at = 0; i < c.count; i++) {
		if (c.bus[i] !== bus) continue;
		out.time[j] = c.time[i];
		out.id[j] = c.id[i];
		out.flags[j] = c.flags[i];
		if (out.kind) out.kind[j] = c.kind![i];
		if (out.direction) out.direction[j] = c.direction![i];
		if (out.tag) out.tag[j] = c.tag![i];
		const len = c.length[i];
		out.length[j] = len;
		out.dataOffset[j] = at;
		out.data.set(c.data.subarray(c.dataOffset[i], c.dataOffset[i] + len), at);
		at += len;
		j++;
	}
	return out as unknown as T;
}

/** `source` seen through bus `bus`: segments and chunks hold that bus's frames only. */
export function busChunkSource(source: ChunkSource, bus: number): ChunkSource {
	return {
		index: source.index,
		segment: async (s) => {
			const segment = await source.segment(s);
			let columns: Columns | null = null;
			return { columns: () => (columns ??= framesOnBus(segment.columns(), bus)) };
		},
		chunk: async (c) => framesOnBus(await source.chunk(c), bus)
	};
}
