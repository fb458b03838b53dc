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

/** The first decode: every segment once, in capture order. `onSegment` reports progress. */
export async function decodeChunked(
	source: ChunkSource,
	compiled: CompiledMap,
	options: DecodeCaptureOptions = {},
	onSegment: (done: number, total: number) => void = () => {}
): Promise<ChunkedDecoding> {
	const { index } = source;
	const { frameCount, minTime, maxTime } = index.header;
	const survey = createIdSurvey(compiled);
	const load = createLoadCounter({
		bitrate: options.bitrate ?? compiled.map.bitrate,
		windowSeconds: options.loadWindowSeconds,
		dataBitrate: options.dataBitrate,
		first: frameCount ? minTime : Infinity,
		last: frameCount ? maxTime : -Infinity
	});
	const j1939 = index.keyExtended.some((e) => e === 1) ? createJ1939Scanner() : null;
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
		const columns = (await source.segment(s)).columns();
		survey.add(columns);
		load.add(columns);
		j1939?.add(columns);
		decodeChannels(columns, compiled).forEach((c, k) => {
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
		onSegment(s + 1, index.segmentCount);
	}
	const { ids, unknownIds } = survey.finish();
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
		ids,
		unknownIds,
		busLoad: load.finish(),
		j1939: j1939 ? j1939.finish() : null,
		pyramids: builders.map((b) => b.finish())
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
		values.push(c.value.subarray(0, c.count));
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
