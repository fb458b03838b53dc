/**
 * Decoding a capture kept in the chunked store (chunk-store.ts) one segment at a time, so memory
 * holds one segment's frames and channels whatever the capture's size:
 *  - decodeChunked: the first decode of a capture with a map — every figure decodeCapture gives
 *    (channel statistics, ID survey, bus load, J1939) plus a min/max pyramid per channel
 *    (pyramid.ts), without keeping any channel's samples;
 *  - channelSamples: one channel's samples over a time range, decoded from the chunks of its
 *    identifier(s) only;
 *  - decodedSegments: every channel segment by segment in capture order, for exports.
 * Results equal decodeCapture's on the same frames (the tests compare them).
 */
import type { CompiledMap } from '../decoder';
import type { Channel } from './channels';
import { decodeChannels } from './channels';
import { readChunk, Segment, type Chunk, type ChunkIndex } from './chunk-store';
import type { DecodeCaptureOptions } from './decode-capture';
import type { FrameColumns } from './frame-columns';
import { FLAG_FD } from './frame-store';
import { createIdSurvey, type IdStatistics, type UnknownId } from './id-statistics';
import { createJ1939Scanner, type J1939Scan } from './j1939-scan';
import { createLoadCounter, type LoadOverTime } from './load-over-time';
import { PyramidBuilder, type Pyramid } from './pyramid';

/** Where the segments and chunks of one stored capture come from (storage, a test's memory…). */
export interface ChunkSource {
	index: ChunkIndex;
	/** Segment s (only its frames in capture order are read; busChunkSource filters them). */
	segment(s: number): Promise<Pick<Segment, 'columns'>>;
	/** Chunk c of the index's chunk table (a ranged read of its segment). */
	chunk(c: number): Promise<Chunk>;
}

/** A decoded channel's figures without its samples. */
export type ChannelStatistics = Omit<Channel, 'time' | 'value'> & {
	/** Times of its first and last sample in capture order (null without samples). */
	firstTime: number | null;
	lastTime: number | null;
};

export interface ChunkedDecoding {
	frameCount: number;
	duration: number;
	channels: ChannelStatistics[];
	ids: IdStatistics[];
	unknownIds: UnknownId[];
	busLoad: LoadOverTime;
	j1939: J1939Scan | null;
	/** One per channel, same order. */
	pyramids: Pyramid[];
}

interface Accumulator {
	count: number;
	min: number;
	max: number;
	sum: number;
	last: number;
	outOfRange: number;
	notAvailable: number;
	error: number;
	firstTime: number | null;
	lastTime: number | null;
}

/** The figures of the whole bus (every frame in capture order): the part one worker of a split decode does. */
export interface BusFigures {
	ids: IdStatistics[];
	unknownIds: UnknownId[];
	busLoad: LoadOverTime;
	j1939: J1939Scan | null;
}

/**
 * One part of the first decode, so it can be split across worker threads with the same results:
 * `bus` takes the figures that need every frame in capture order (ID survey, bus load, J1939);
 * `frames` lists the compiled frames whose channels this part decodes (null = every frame).
 * A channel's statistics and pyramid depend only on its own samples in capture order, so parts that
 * own disjoint frames give exactly the figures one pass would (mergeDecodeParts joins them).
 */
export interface DecodePart {
	bus: boolean;
	frames: readonly number[] | null;
}

export interface ChunkedDecodingPart {
	frameCount: number;
	duration: number;
	/** Every channel of the map, in order; those of frames this part does not own have no samples. */
	channels: ChannelStatistics[];
	/** One per channel, same order (empty for channels of frames this part does not own). */
	pyramids: Pyramid[];
	/** Compiled frames this part decoded. */
	frames: number[];
	bus: BusFigures | null;
}

/** The first decode: every segment once, in capture order. `onSegment` reports progress. */
export async function decodeChunked(
	source: ChunkSource,
	compiled: CompiledMap,
	options: DecodeCaptureOptions = {},
	onSegment: (done: number, total: number) => void = () => {}
): Promise<ChunkedDecoding> {
	const part = await decodeChunkedPart(
		source,
		compiled,
		{ bus: true, frames: null },
		options,
		onSegment
	);
	return {
		frameCount: part.frameCount,
		duration: part.duration,
		channels: part.channels,
		pyramids: part.pyramids,
		...part.bus!
	};
}

/**
 * Splits the first decode into `count` parts for as many workers: the bus figures go to part 0, the
 * map's frames to the parts by the work they bring (their frames in the capture × (1 + channels),
 * a proxy), part 0 counting the bus figures as `busWeight` per frame of the capture: measured on
 * the capture benchmark's workload (bench/captures.ts, 4 M frames, bundled code, a busy machine),
 * the survey and bus load cost about 135 ns a frame, decoding a frame of four channels from its
 * chunk about 180 ns, i.e. 5 units of about 36 ns. Parts left empty are dropped.
 */
export function planDecodeParts(
	index: ChunkIndex,
	compiled: CompiledMap,
	count: number,
	busWeight = 4
): DecodePart[] {
	if (count <= 1) return [{ bus: true, frames: null }];
	const work = new Float64Array(compiled.frames.length);
	for (let k = 0; k < index.keyCount; k++) {
		const f = compiled.indexOf(index.keyId[k], index.keyExtended[k] === 1);
		if (f >= 0) work[f] += index.frameCountOf(k) * (1 + compiled.frames[f].channelCount);
	}
	const load = new Float64Array(count);
	load[0] = busWeight * index.header.frameCount;
	const owned: number[][] = Array.from({ length: count }, () => []);
	// Largest first, each to the least loaded part (deterministic: ties go to the lower part).
	const order = [...work.keys()].sort((a, b) => work[b] - work[a] || a - b);
	for (const f of order) {
		let p = 0;
		for (let q = 1; q < count; q++) if (load[q] < load[p]) p = q;
		owned[p].push(f);
		load[p] += work[f];
	}
	return owned
		.map((frames, p) => ({ bus: p === 0, frames: frames.sort((a, b) => a - b) }))
		.filter((part) => part.bus || part.frames.length > 0);
}

function hasFdFrames(chunk: Chunk): boolean {
	for (let i = 0; i < chunk.count; i++) if (chunk.flags[i] & FLAG_FD) return true;
	return false;
}

/** Which keys a part decodes from their own chunks, and which from the segment in capture order. */
function keysOfPart(index: ChunkIndex, compiled: CompiledMap, frames: readonly number[]) {
	const mine = new Uint8Array(compiled.frames.length);
	for (const f of frames) mine[f] = 1;
	const keysOf = new Map<number, number[]>();
	for (let k = 0; k < index.keyCount; k++) {
		const f = compiled.indexOf(index.keyId[k], index.keyExtended[k] === 1);
		if (f >= 0 && mine[f]) keysOf.set(f, [...(keysOf.get(f) ?? []), k]);
	}
	// A frame fed by one identifier: its chunks hold its frames in capture order. A frame several
	// identifiers feed (J1939 by PGN) is taken from the segment in capture order, to keep their order.
	const fromChunk = new Uint8Array(index.keyCount);
	const inOrder = new Uint8Array(index.keyCount);
	for (const keys of keysOf.values())
		for (const k of keys) (keys.length === 1 ? fromChunk : inOrder)[k] = 1;
	return { fromChunk, inOrder, any: inOrder.some((x) => x === 1) };
}

/**
 * The frames of a part in one segment, as pieces: its identifiers' chunks, then its
 * multi-identifier frames in capture order. Each frame's frames are in one piece, in capture order.
 */
function partPieces(segment: Segment, keys: ReturnType<typeof keysOfPart>): FrameColumns[] {
	const pieces: FrameColumns[] = [];
	segment.chunks.forEach((c, slot) => {
		if (keys.fromChunk[c.key]) pieces.push(segment.chunk(slot));
	});
	if (keys.any) {
		let wanted = false;
		for (const c of segment.chunks) if (keys.inOrder[c.key]) wanted = true;
		if (wanted) {
			const columns = segment.columns();
			const keep: number[] = [];
			for (let i = 0; i < columns.count; i++)
				if (keys.inOrder[segment.chunks[segment.order[i]].key]) keep.push(i);
			pieces.push(selectFrames(columns, keep));
		}
	}
	return pieces;
}

function selectFrames(columns: FrameColumns, keep: readonly number[]): FrameColumns {
	const n = keep.length;
	const out = {
		count: n,
		time: new Float64Array(n),
		id: new Uint32Array(n),
		flags: new Uint8Array(n),
		length: new Uint8Array(n),
		dataOffset: new Uint32Array(n),
		data: new Uint8Array(keep.reduce((b, i) => b + columns.length[i], 0))
	};
	let at = 0;
	keep.forEach((i, j) => {
		out.time[j] = columns.time[i];
		out.id[j] = columns.id[i];
		out.flags[j] = columns.flags[i];
		out.length[j] = columns.length[i];
		out.dataOffset[j] = at;
		const from = columns.dataOffset[i];
		out.data.set(columns.data.subarray(from, from + columns.length[i]), at);
		at += columns.length[i];
	});
	return out;
}

/** One part of the first decode (DecodePart): every segment once, in capture order. */
export async function decodeChunkedPart(
	source: ChunkSource,
	compiled: CompiledMap,
	part: DecodePart,
	options: DecodeCaptureOptions = {},
	onSegment: (done: number, total: number) => void = () => {}
): Promise<ChunkedDecodingPart> {
	const { index } = source;
	const { frameCount, minTime, maxTime } = index.header;
	const survey = part.bus ? createIdSurvey(compiled) : null;
	const load = part.bus
		? createLoadCounter({
				bitrate: options.bitrate ?? compiled.map.bitrate,
				windowSeconds: options.loadWindowSeconds,
				dataBitrate: options.dataBitrate,
				first: frameCount ? minTime : Infinity,
				last: frameCount ? maxTime : -Infinity
			})
		: null;
	const j1939 = part.bus && index.keyExtended.some((e) => e === 1) ? createJ1939Scanner() : null;
	const frames = part.frames ? [...part.frames] : compiled.frames.map((_, f) => f);
	const keys = part.frames ? keysOfPart(index, compiled, part.frames) : null;
	const decodes = frames.length > 0;
	const accumulators: Accumulator[] = compiled.channels.map(() => ({
		count: 0,
		min: Infinity,
		max: -Infinity,
		sum: 0,
		last: NaN,
		outOfRange: 0,
		notAvailable: 0,
		error: 0,
		firstTime: null,
		lastTime: null
	}));
	const builders = compiled.channels.map(() => new PyramidBuilder());
	for (let s = 0; s < index.segmentCount; s++) {
		const read = await source.segment(s);
		// Only a whole store's segments carry their chunk table; a source that filters frames (one
		// bus of several) is decoded in one pass, never split (decoding.ts).
		const segment = read instanceof Segment ? read : null;
		if (keys && !segment) throw new Error('a split decode reads a whole store, not a filtered one');
		if (part.bus) {
			// The survey is per identifier and a classical frame's bus bits are a whole number (so
			// their sums do not depend on order): a split decode's bus part reads the chunks as
			// they are. J1939 transfers, FD frames' fractional bit times and a part that decodes
			// every frame anyway take the segment rebuilt in capture order.
			const chunks =
				keys && !j1939 && segment ? segment.chunks.map((_, slot) => segment.chunk(slot)) : null;
			const pieces = chunks && !chunks.some(hasFdFrames) ? chunks : [read.columns()];
			for (const piece of pieces) {
				survey!.add(piece);
				load!.add(piece);
				j1939?.add(piece);
			}
		}
		// A channel's samples are all in one piece, so each channel still sees them in capture order.
		const pieces = !decodes ? [] : keys && segment ? partPieces(segment, keys) : [read.columns()];
		for (const piece of pieces) {
			decodeChannels(piece, compiled).forEach((c, k) => {
				if (c.count === 0 && c.notAvailableCount === 0 && c.errorCount === 0) return;
				const a = accumulators[k];
				a.count += c.count;
				// One value at a time, in capture order, so the mean is the same sum decodeChannels makes.
				for (let j = 0; j < c.count; j++) a.sum += c.value[j];
				if (c.count > 0) {
					if (c.min! < a.min) a.min = c.min!;
					if (c.max! > a.max) a.max = c.max!;
					a.last = c.last!;
					a.firstTime ??= c.time[0];
					a.lastTime = c.time[c.count - 1];
					builders[k].add(c.time, c.value, c.count);
				}
				a.outOfRange += c.outOfRangeCount;
				a.notAvailable += c.notAvailableCount;
				a.error += c.errorCount;
			});
		}
		onSegment(s + 1, index.segmentCount);
	}
	const ids = survey?.finish();
	return {
		frameCount,
		duration: frameCount ? maxTime - minTime : 0,
		channels: compiled.channels.map((info, k) => {
			const a = accumulators[k];
			return {
				info,
				count: a.count,
				min: a.count ? a.min : null,
				max: a.count ? a.max : null,
				mean: a.count ? a.sum / a.count : null,
				last: a.count ? a.last : null,
				outOfRangeCount: a.outOfRange,
				notAvailableCount: a.notAvailable,
				errorCount: a.error,
				firstTime: a.firstTime,
				lastTime: a.lastTime
			};
		}),
		pyramids: builders.map((b) => b.finish()),
		frames,
		bus:
			ids && load
				? {
						ids: ids.ids,
						unknownIds: ids.unknownIds,
						busLoad: load.finish(),
						j1939: j1939 ? j1939.finish() : null
					}
				: null
	};
}

/** The compiled frame of each channel (-1 for none). */
export function framesOfChannels(compiled: CompiledMap): Int32Array {
	const out = new Int32Array(compiled.channels.length).fill(-1);
	compiled.frames.forEach((frame, f) =>
		out.fill(f, frame.channelStart, frame.channelStart + frame.channelCount)
	);
	return out;
}

/** The parts of a split decode joined: each channel from the part that owns its frame, the bus figures from the bus part. */
export function mergeDecodeParts(
	compiled: CompiledMap,
	parts: readonly ChunkedDecodingPart[]
): ChunkedDecoding {
	const bus = parts.find((p) => p.bus)?.bus;
	if (!bus) throw new Error('a split decode needs the part with the bus figures');
	const owner = new Int32Array(compiled.frames.length).fill(-1);
	parts.forEach((p, at) => p.frames.forEach((f) => (owner[f] = at)));
	const frameOf = framesOfChannels(compiled);
	const from = (k: number) => parts[Math.max(0, owner[frameOf[k]])];
	return {
		frameCount: parts[0].frameCount,
		duration: parts[0].duration,
		channels: compiled.channels.map((_, k) => from(k).channels[k]),
		pyramids: compiled.channels.map((_, k) => from(k).pyramids[k]),
		...bus
	};
}

/** The compiled frame that carries channel `channel`, or -1. */
export function frameOfChannel(compiled: CompiledMap, channel: number): number {
	return compiled.frames.findIndex(
		(f) => channel >= f.channelStart && channel < f.channelStart + f.channelCount
	);
}

/** The identifiers of the capture that the map decodes with compiled frame f (J1939 frames can match several). */
export function keysOfFrame(index: ChunkIndex, compiled: CompiledMap, f: number): number[] {
	const keys: number[] = [];
	for (let k = 0; k < index.keyCount; k++)
		if (compiled.indexOf(index.keyId[k], index.keyExtended[k] === 1) === f) keys.push(k);
	return keys;
}

function concat(parts: Float64Array[]): Float64Array {
	let n = 0;
	for (const p of parts) n += p.length;
	const out = new Float64Array(n);
	let at = 0;
	for (const p of parts) {
		out.set(p, at);
		at += p.length;
	}
	return out;
}

/**
 * Channel `channel`'s samples from every chunk of its identifier whose time span meets
 * [from, to] (whole chunks, so a few samples either side come too). With one identifier only its
 * chunks are read; a frame that several identifiers feed (J1939 by PGN) reads the segments that
 * hold them, to keep their capture order.
 */
export async function channelSamples(
	source: ChunkSource,
	compiled: CompiledMap,
	channel: number,
	from = -Infinity,
	to = Infinity
): Promise<{ time: Float64Array; value: Float64Array }> {
	const { index } = source;
	const f = frameOfChannel(compiled, channel);
	const keys = f < 0 ? [] : keysOfFrame(index, compiled, f);
	const times: Float64Array[] = [];
	const values: Float64Array[] = [];
	const take = (columns: FrameColumns) => {
		const c = decodeChannels(columns, compiled)[channel];
		times.push(c.time.subarray(0, c.count));
		// A copy: the values are a view into the table of every channel of the frame, which would
		// otherwise stay in memory until the pieces are joined.
		values.push(c.value.slice(0, c.count));
	};
	if (keys.length === 1) {
		const k = keys[0];
		for (let c = index.keyChunkStart[k]; c < index.keyChunkStart[k + 1]; c++) {
			if (index.chunkMaxTime[c] < from || index.chunkMinTime[c] > to) continue;
			take(await source.chunk(c));
		}
	} else if (keys.length > 1) {
		const segments = new Set<number>();
		for (const k of keys)
			for (let c = index.keyChunkStart[k]; c < index.keyChunkStart[k + 1]; c++)
				if (!(index.chunkMaxTime[c] < from || index.chunkMinTime[c] > to))
					segments.add(index.chunkSegment[c]);
		for (const s of [...segments].sort((a, b) => a - b)) take((await source.segment(s)).columns());
	}
	return { time: concat(times), value: concat(values) };
}

/** Every segment in capture order with its decoded channels (for exports); one segment in memory at a time. */
export async function* decodedSegments(
	source: ChunkSource,
	compiled: CompiledMap | null
): AsyncGenerator<{ segment: number; columns: FrameColumns; channels: Channel[] }> {
	for (let s = 0; s < source.index.segmentCount; s++) {
		const columns = (await source.segment(s)).columns();
		yield { segment: s, columns, channels: compiled ? decodeChannels(columns, compiled) : [] };
	}
}

/**
 * A ChunkSource over stored bytes: `segment(s)` reads a whole segment, `range(s, offset, length)`
 * a byte range of one (when absent, chunks are cut from whole segments).
 */
export function chunkSource(
	index: ChunkIndex,
	read: {
		segment(s: number): Promise<Uint8Array>;
		range?(s: number, offset: number, length: number): Promise<Uint8Array>;
	}
): ChunkSource {
	return {
		index,
		segment: async (s) => new Segment(await read.segment(s), index.keyId),
		chunk: async (c) => {
			const s = index.chunkSegment[c];
			const offset = index.chunkOffset[c];
			const length = index.chunkBytes[c];
			const bytes = read.range
				? await read.range(s, offset, length)
				: (await read.segment(s)).subarray(offset, offset + length);
			return readChunk(bytes, index.chunkFrames[c], index.keyId[index.chunkKey[c]]);
		}
	};
}
