/**
 * The chunked, columnar frame store a processed capture is kept in (docs/architecture.md, "Capture
 * storage"). Frames are written while the CSV is parsed, in **segments** of a fixed number of
 * frames in capture order; inside a segment they are grouped by identifier into **chunks**, one per
 * (ID, extended) seen in it, each column by column:
 *
 *   time f64[n] · length u8[n] · payload bytes · flags · kind · direction · bus (u8 each) · tag (u16)
 *
 * The four small columns are stored as one value when every frame of the chunk shares it (today's CSV
 * layouts fill defaults), as an array otherwise. A segment also keeps each frame's chunk slot in
 * capture order, so the segment can be rebuilt in capture order (frame pages, J1939 transport, bus
 * load, exports) and a frame's global index is `segment × segmentFrames + position`.
 *
 * A small **index** lists the identifiers, the segments and, per identifier, its chunks (segment,
 * byte range, frame count, time span), so a channel is decoded from the chunks of its ID only, read
 * with ranged reads. Memory while writing is one segment, whatever the capture's size.
 * Byte order is little-endian throughout (typed arrays are written as they are; the magic numbers
 * catch a big-endian reader).
 */
import type { FrameColumns } from './frame-columns';
import { FLAG_BRS, FLAG_EXTENDED, FLAG_FD, type FrameExtras, type FrameSink } from './frame-store';

/** Frames per segment: about 3 MB of columns for classical frames. */
export const DEFAULT_SEGMENT_FRAMES = 1 << 17;

const SEGMENT_MAGIC = 0x47435746; // "FWCG"
const INDEX_MAGIC = 0x49435746; // "FWCI"
const FORMAT_VERSION = 1;
const SEGMENT_HEADER_BYTES = 24;
const INDEX_HEADER_BYTES = 16;

const align8 = (n: number) => (n + 7) & ~7;

/** (ID, extended) as one number: IDs are below 2^29, so `id · 2 + extended` is exact. */
export const keyCode = (id: number, extended: boolean) => id * 2 + (extended ? 1 : 0);

export interface ChunkStoreOrigin {
	/** Seconds of the first frame as written in the file (epoch seconds when `epoch`). */
	timeOrigin: number;
	epoch: boolean;
}

// ---------------------------------------------------------------- small columns

/**
 * A small column of one chunk as written: a number when every frame has that value (mode 0), the
 * values otherwise (mode 1). u8 columns: mode byte, then one byte or one per frame; u16 columns:
 * the same, values little-endian byte by byte (no alignment needed).
 */
type Small = number | Uint8Array | Uint16Array;

/** The one value of values[0, n), or -1 when they differ (or n is 0, which is written as 0). */
function sameValue(values: Uint8Array | Uint16Array, n: number): number {
	if (n === 0) return 0;
	const first = values[0];
	for (let i = 1; i < n; i++) if (values[i] !== first) return -1;
	return first;
}
function small(values: Uint8Array | Uint16Array): Small {
	const same = sameValue(values, values.length);
	return same >= 0 ? same : values;
}
const smallU8Bytes = (c: Small) => (typeof c === 'number' ? 2 : 1 + c.length);
const smallU16Bytes = (c: Small) => (typeof c === 'number' ? 3 : 1 + 2 * c.length);
function writeSmallU8(out: Uint8Array, at: number, c: Small): number {
	if (typeof c === 'number') {
		out[at] = 0;
		out[at + 1] = c;
		return at + 2;
	}
	out[at] = 1;
	out.set(c, at + 1);
	return at + 1 + c.length;
}
function writeSmallU16(out: Uint8Array, at: number, c: Small): number {
	if (typeof c === 'number') {
		out[at] = 0;
		out[at + 1] = c & 0xff;
		out[at + 2] = c >>> 8;
		return at + 3;
	}
	out[at++] = 1;
	for (let i = 0; i < c.length; i++) {
		out[at++] = c[i] & 0xff;
		out[at++] = c[i] >>> 8;
	}
	return at;
}
function readU8Column(bytes: Uint8Array, at: number, n: number): [Uint8Array, number] {
	if (bytes[at] === 0) return [new Uint8Array(n).fill(bytes[at + 1]), at + 2];
	return [bytes.slice(at + 1, at + 1 + n), at + 1 + n];
}
function readU16Column(bytes: Uint8Array, at: number, n: number): [Uint16Array, number] {
	const values = new Uint16Array(n);
	if (bytes[at] === 0) return [values.fill(bytes[at + 1] | (bytes[at + 2] << 8)), at + 3];
	for (let i = 0, p = at + 1; i < n; i++, p += 2) values[i] = bytes[p] | (bytes[p + 1] << 8);
	return [values, at + 1 + 2 * n];
}

// ---------------------------------------------------------------- chunks

/** One identifier's frames of one segment, column by column (a FrameColumns of one ID). */
export interface Chunk extends FrameColumns {
	readonly kind: Uint8Array;
	readonly direction: Uint8Array;
	readonly bus: Uint8Array;
	readonly tag: Uint16Array;
}

/** Reads a chunk of `n` frames of ID `id` from `bytes` (its own bytes, from a segment or a ranged read). */
export function readChunk(bytes: Uint8Array, n: number, id: number): Chunk {
	if (bytes.byteLength < 9 * n) throw new Error('stored capture is damaged: a chunk is too short');
	const time = new Float64Array(n);
	new Uint8Array(time.buffer).set(bytes.subarray(0, 8 * n));
	const length = bytes.slice(8 * n, 9 * n);
	const dataOffset = new Uint32Array(n);
	let payloadBytes = 0;
	for (let i = 0; i < n; i++) {
		if (length[i] > 64) throw new Error('stored capture is damaged: a payload is over 64 bytes');
		dataOffset[i] = payloadBytes;
		payloadBytes += length[i];
	}
	let at = 9 * n;
	const data = bytes.slice(at, at + payloadBytes);
	at += payloadBytes;
	const [flags, a1] = readU8Column(bytes, at, n);
	const [kind, a2] = readU8Column(bytes, a1, n);
	const [direction, a3] = readU8Column(bytes, a2, n);
	const [bus, a4] = readU8Column(bytes, a3, n);
	const [tag, end] = readU16Column(bytes, a4, n);
	at = end;
	if (at > bytes.byteLength) throw new Error('stored capture is damaged: a chunk is cut short');
	return {
		count: n,
		time,
		id: new Uint32Array(n).fill(id),
		flags,
		length,
		dataOffset,
		data,
		kind,
		direction,
		bus,
		tag
	};
}

// ---------------------------------------------------------------- segments

export interface SegmentChunkEntry {
	/** Index into the capture's identifier table. */
	key: number;
	frames: number;
	/** Byte range inside the segment. */
	offset: number;
	bytes: number;
	minTime: number;
	maxTime: number;
}

/** A segment read back: its chunks, and each frame's chunk slot in capture order. */
export class Segment {
	readonly count: number;
	readonly chunks: SegmentChunkEntry[];
	/** order[i] = chunk slot of the segment's frame i (capture order). */
	readonly order: Uint32Array;
	readonly #bytes: Uint8Array;
	readonly #keyIds: ArrayLike<number>;
	#columns: (FrameColumns & Pick<Chunk, 'kind' | 'direction' | 'bus' | 'tag'>) | null = null;

	/** `keyIds[k]` = the ID of identifier k (from the index), to fill the ID column. */
	constructor(bytes: Uint8Array, keyIds: ArrayLike<number>) {
		const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
		if (bytes.byteLength < SEGMENT_HEADER_BYTES || view.getUint32(0, true) !== SEGMENT_MAGIC)
			throw new Error('not a stored capture segment: wrong magic number');
		const version = view.getUint32(4, true);
		if (version !== FORMAT_VERSION)
			throw new Error(`stored capture segment format ${version} is not supported`);
		this.count = view.getUint32(8, true);
		const chunkCount = view.getUint32(12, true);
		const width = view.getUint32(16, true);
		let at = align8(SEGMENT_HEADER_BYTES);
		this.chunks = [];
		for (let c = 0; c < chunkCount; c++, at += 32) {
			this.chunks.push({
				key: view.getUint32(at, true),
				frames: view.getUint32(at + 4, true),
				offset: view.getUint32(at + 8, true),
				bytes: view.getUint32(at + 12, true),
				minTime: view.getFloat64(at + 16, true),
				maxTime: view.getFloat64(at + 24, true)
			});
		}
		this.order = new Uint32Array(this.count);
		for (let i = 0; i < this.count; i++, at += width)
			this.order[i] =
				width === 1 ? bytes[at] : width === 2 ? view.getUint16(at, true) : view.getUint32(at, true);
		this.#bytes = bytes;
		this.#keyIds = keyIds;
	}

	chunk(slot: number): Chunk {
		const e = this.chunks[slot];
		return readChunk(
			this.#bytes.subarray(e.offset, e.offset + e.bytes),
			e.frames,
			this.#keyIds[e.key]
		);
	}

	/** Every frame of the segment in capture order, all columns (built once, then kept). */
	columns(): FrameColumns & Pick<Chunk, 'kind' | 'direction' | 'bus' | 'tag'> {
		if (this.#columns) return this.#columns;
		const n = this.count;
		const chunks = this.chunks.map((_, slot) => this.chunk(slot));
		let payloadBytes = 0;
		for (const c of chunks) payloadBytes += c.data.byteLength;
		const out = {
			count: n,
			time: new Float64Array(n),
			id: new Uint32Array(n),
			flags: new Uint8Array(n),
			length: new Uint8Array(n),
			dataOffset: new Uint32Array(n),
			data: new Uint8Array(payloadBytes),
			kind: new Uint8Array(n),
			direction: new Uint8Array(n),
			bus: new Uint8Array(n),
			tag: new Uint16Array(n)
		};
		const cursor = new Uint32Array(chunks.length);
		let at = 0;
		for (let i = 0; i < n; i++) {
			const slot = this.order[i];
			const c = chunks[slot];
			const j = cursor[slot]++;
			out.time[i] = c.time[j];
			out.id[i] = c.id[j];
			out.flags[i] = c.flags[j];
			out.kind[i] = c.kind[j];
			out.direction[i] = c.direction[j];
			out.bus[i] = c.bus[j];
			out.tag[i] = c.tag[j];
			const len = c.length[j];
			out.length[i] = len;
			out.dataOffset[i] = at;
			const from = c.dataOffset[j];
			for (let k = 0; k < len; k++) out.data[at + k] = c.data[from + k];
			at += len;
		}
		return (this.#columns = out);
	}
}

let slots = new Int32Array(0);
/** A key → slot table of at least `keyCount` entries, all -1 (kept between segments). */
function slotTable(keyCount: number): Int32Array {
	if (slots.length < keyCount) {
		const next = new Int32Array(Math.max(keyCount, 2 * slots.length)).fill(-1);
		slots = next;
	}
	return slots;
}

/** Encodes `n` frames held in capture order (columns of length ≥ n) as one segment. */
function encodeSegment(
	n: number,
	keyCount: number,
	cols: {
		time: Float64Array;
		key: Uint32Array;
		flags: Uint8Array;
		length: Uint8Array;
		dataOffset: Uint32Array;
		data: Uint8Array;
		kind: Uint8Array;
		direction: Uint8Array;
		bus: Uint8Array;
		tag: Uint16Array;
	}
): { bytes: Uint8Array; chunks: SegmentChunkEntry[] } {
	// Chunk slots in order of first appearance in the segment (an array lookup per frame, no Map).
	const slotOfKey = slotTable(keyCount);
	const slot = new Uint32Array(n);
	const keys: number[] = [];
	for (let i = 0; i < n; i++) {
		const key = cols.key[i];
		let s = slotOfKey[key];
		if (s < 0) {
			s = slotOfKey[key] = keys.length;
			keys.push(key);
		}
		slot[i] = s;
	}
	for (const key of keys) slotOfKey[key] = -1; // ready for the next segment
	const chunkCount = keys.length;
	// Each slot's frames, in capture order: a counting sort.
	const start = new Uint32Array(chunkCount + 1);
	for (let i = 0; i < n; i++) start[slot[i] + 1]++;
	for (let s = 0; s < chunkCount; s++) start[s + 1] += start[s];
	const members = new Uint32Array(n);
	const fill = start.slice(0, chunkCount);
	for (let i = 0; i < n; i++) members[fill[slot[i]]++] = i;

	// Per chunk: its small columns gathered, to size and write them. A column with one value over
	// the whole segment (today's CSV layouts fill defaults) is that value in every chunk, so it is
	// not gathered per chunk at all.
	const segmentFlags = sameValue(cols.flags, n);
	const segmentKind = sameValue(cols.kind, n);
	const segmentDirection = sameValue(cols.direction, n);
	const segmentBus = sameValue(cols.bus, n);
	const segmentTag = sameValue(cols.tag, n);
	const chunkColumns = keys.map((_, s) => {
		const m = start[s + 1] - start[s];
		const from = start[s];
		const pick8 = (src: Uint8Array, same: number): Small => {
			if (same >= 0) return same;
			const out = new Uint8Array(m);
			for (let j = 0; j < m; j++) out[j] = src[members[from + j]];
			return small(out);
		};
		let tag: Small = segmentTag;
		if (segmentTag < 0) {
			const picked = new Uint16Array(m);
			for (let j = 0; j < m; j++) picked[j] = cols.tag[members[from + j]];
			tag = small(picked);
		}
		let payload = 0;
		let minTime = Infinity;
		let maxTime = -Infinity;
		for (let j = 0; j < m; j++) {
			const i = members[from + j];
			payload += cols.length[i];
			const t = cols.time[i];
			if (t < minTime) minTime = t;
			if (t > maxTime) maxTime = t;
		}
		const flags = pick8(cols.flags, segmentFlags);
		const kind = pick8(cols.kind, segmentKind);
		const direction = pick8(cols.direction, segmentDirection);
		const bus = pick8(cols.bus, segmentBus);
		const bytes = align8(
			9 * m +
				payload +
				smallU8Bytes(flags) +
				smallU8Bytes(kind) +
				smallU8Bytes(direction) +
				smallU8Bytes(bus) +
				smallU16Bytes(tag)
		);
		return { m, flags, kind, direction, bus, tag, bytes, minTime, maxTime };
	});

	const width = chunkCount <= 0x100 ? 1 : chunkCount <= 0x10000 ? 2 : 4;
	const directoryAt = align8(SEGMENT_HEADER_BYTES);
	const orderAt = directoryAt + 32 * chunkCount;
	let at = align8(orderAt + width * n);
	const entries: SegmentChunkEntry[] = chunkColumns.map((c, s) => {
		const entry = {
			key: keys[s],
			frames: c.m,
			offset: at,
			bytes: c.bytes,
			minTime: c.minTime,
			maxTime: c.maxTime
		};
		at += c.bytes;
		return entry;
	});
	const bytes = new Uint8Array(at);
	const view = new DataView(bytes.buffer);
	view.setUint32(0, SEGMENT_MAGIC, true);
	view.setUint32(4, FORMAT_VERSION, true);
	view.setUint32(8, n, true);
	view.setUint32(12, chunkCount, true);
	view.setUint32(16, width, true);
	entries.forEach((e, s) => {
		const d = directoryAt + 32 * s;
		view.setUint32(d, e.key, true);
		view.setUint32(d + 4, e.frames, true);
		view.setUint32(d + 8, e.offset, true);
		view.setUint32(d + 12, e.bytes, true);
		view.setFloat64(d + 16, e.minTime, true);
		view.setFloat64(d + 24, e.maxTime, true);
	});
	for (let i = 0, p = orderAt; i < n; i++, p += width) {
		if (width === 1) bytes[p] = slot[i];
		else if (width === 2) view.setUint16(p, slot[i], true);
		else view.setUint32(p, slot[i], true);
	}
	const source = new DataView(cols.data.buffer, cols.data.byteOffset, cols.data.byteLength);
	entries.forEach((e, s) => {
		const c = chunkColumns[s];
		const m = c.m;
		const base = e.offset;
		// Chunks start on 8-byte boundaries, so the time column is written through a typed view.
		const times = new Float64Array(bytes.buffer, base, m);
		for (let j = 0; j < m; j++) times[j] = cols.time[members[start[s] + j]];
		let p = base + 8 * m;
		for (let j = 0; j < m; j++) bytes[p++] = cols.length[members[start[s] + j]];
		for (let j = 0; j < m; j++) {
			const i = members[start[s] + j];
			let from = cols.dataOffset[i];
			let len = cols.length[i];
			// Four bytes at a time (unaligned reads and writes through DataViews, the same bytes).
			for (; len >= 4; len -= 4, from += 4, p += 4) view.setUint32(p, source.getUint32(from));
			for (; len > 0; len--) bytes[p++] = cols.data[from++];
		}
		p = writeSmallU8(bytes, p, c.flags);
		p = writeSmallU8(bytes, p, c.kind);
		p = writeSmallU8(bytes, p, c.direction);
		p = writeSmallU8(bytes, p, c.bus);
		writeSmallU16(bytes, p, c.tag);
	});
	return { bytes, chunks: entries };
}

// ---------------------------------------------------------------- index

export interface ChunkIndexHeader {
	format: 'framewright-chunks@1';
	segmentFrames: number;
	frameCount: number;
	origin: ChunkStoreOrigin;
	/** Smallest and largest frame time (0 when empty). */
	minTime: number;
	maxTime: number;
	/** Bus names; index 0 is the one unnamed bus of a CSV capture. */
	buses: string[];
	/** Tag names; a frame's tag column holds index + 1 (0 = no tag). */
	tags: string[];
}

/** The arrays of a ChunkIndex (chunks sorted by key, then segment). */
export interface ChunkIndexFields {
	header: ChunkIndexHeader;
	keyId: Uint32Array;
	keyExtended: Uint8Array;
	segmentFrames: Uint32Array;
	segmentMinTime: Float64Array;
	segmentMaxTime: Float64Array;
	/** Key k owns chunks `keyChunkStart[k] … keyChunkStart[k + 1]`. */
	keyChunkStart: Uint32Array;
	chunkSegment: Uint32Array;
	chunkFrames: Uint32Array;
	/** Byte range of the chunk inside its segment. */
	chunkOffset: Uint32Array;
	chunkBytes: Uint32Array;
	chunkMinTime: Float64Array;
	chunkMaxTime: Float64Array;
}

/** The capture's table of contents: identifiers, segments, and each identifier's chunks. */
export class ChunkIndex implements ChunkIndexFields {
	readonly header: ChunkIndexHeader;
	readonly keyId: Uint32Array;
	readonly keyExtended: Uint8Array;
	readonly segmentFrames: Uint32Array;
	readonly segmentMinTime: Float64Array;
	readonly segmentMaxTime: Float64Array;
	readonly keyChunkStart: Uint32Array;
	readonly chunkSegment: Uint32Array;
	readonly chunkFrames: Uint32Array;
	readonly chunkOffset: Uint32Array;
	readonly chunkBytes: Uint32Array;
	readonly chunkMinTime: Float64Array;
	readonly chunkMaxTime: Float64Array;
	/** Frames of the key before each chunk (its rank among the key's frames). */
	readonly chunkRank: Float64Array;
	/** The key each chunk belongs to. */
	readonly chunkKey: Uint32Array;
	#keyOf: Map<number, number> | null = null;

	constructor(fields: ChunkIndexFields) {
		this.header = fields.header;
		this.keyId = fields.keyId;
		this.keyExtended = fields.keyExtended;
		this.segmentFrames = fields.segmentFrames;
		this.segmentMinTime = fields.segmentMinTime;
		this.segmentMaxTime = fields.segmentMaxTime;
		this.keyChunkStart = fields.keyChunkStart;
		this.chunkSegment = fields.chunkSegment;
		this.chunkFrames = fields.chunkFrames;
		this.chunkOffset = fields.chunkOffset;
		this.chunkBytes = fields.chunkBytes;
		this.chunkMinTime = fields.chunkMinTime;
		this.chunkMaxTime = fields.chunkMaxTime;
		this.chunkRank = ranksOf(fields.keyChunkStart, fields.chunkFrames);
		this.chunkKey = new Uint32Array(fields.chunkFrames.length);
		for (let k = 0; k + 1 < fields.keyChunkStart.length; k++)
			this.chunkKey.fill(k, fields.keyChunkStart[k], fields.keyChunkStart[k + 1]);
	}

	/** Bytes held in memory (for byte-bounded caches). */
	get byteLength(): number {
		return (
			this.keyId.byteLength * 2 +
			this.segmentFrames.byteLength * 5 +
			this.chunkSegment.byteLength * 10
		);
	}

	get keyCount(): number {
		return this.keyId.length;
	}
	get segmentCount(): number {
		return this.segmentFrames.length;
	}

	/** The identifier index of (id, extended), or -1 when the capture never saw it. */
	keyOf(id: number, extended: boolean): number {
		if (!this.#keyOf) {
			this.#keyOf = new Map();
			for (let k = 0; k < this.keyCount; k++)
				this.#keyOf.set(keyCode(this.keyId[k], this.keyExtended[k] === 1), k);
		}
		return this.#keyOf.get(keyCode(id, extended)) ?? -1;
	}

	/** Frames of identifier k in the whole capture. */
	frameCountOf(k: number): number {
		const last = this.keyChunkStart[k + 1] - 1;
		return last < this.keyChunkStart[k] ? 0 : this.chunkRank[last] + this.chunkFrames[last];
	}

	toBytes(): Uint8Array {
		const json = new TextEncoder().encode(JSON.stringify(this.header));
		const K = this.keyCount;
		const S = this.segmentCount;
		const C = this.chunkSegment.length;
		const sections: ArrayBufferView[] = [
			this.keyId,
			this.keyExtended,
			this.segmentFrames,
			this.segmentMinTime,
			this.segmentMaxTime,
			this.keyChunkStart,
			this.chunkSegment,
			this.chunkFrames,
			this.chunkOffset,
			this.chunkBytes,
			this.chunkMinTime,
			this.chunkMaxTime
		];
		let total = INDEX_HEADER_BYTES + align8(json.byteLength) + 16;
		for (const s of sections) total += align8(s.byteLength);
		const bytes = new Uint8Array(total);
		const view = new DataView(bytes.buffer);
		view.setUint32(0, INDEX_MAGIC, true);
		view.setUint32(4, FORMAT_VERSION, true);
		view.setUint32(8, json.byteLength, true);
		bytes.set(json, INDEX_HEADER_BYTES);
		let at = INDEX_HEADER_BYTES + align8(json.byteLength);
		view.setUint32(at, K, true);
		view.setUint32(at + 4, S, true);
		view.setUint32(at + 8, C, true);
		at += 16;
		for (const s of sections) {
			bytes.set(new Uint8Array(s.buffer, s.byteOffset, s.byteLength), at);
			at += align8(s.byteLength);
		}
		return bytes;
	}

	static fromBytes(bytes: Uint8Array): ChunkIndex {
		const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
		if (bytes.byteLength < INDEX_HEADER_BYTES || view.getUint32(0, true) !== INDEX_MAGIC)
			throw new Error('not a stored capture index: wrong magic number');
		const version = view.getUint32(4, true);
		if (version !== FORMAT_VERSION)
			throw new Error(`stored capture index format ${version} is not supported`);
		const jsonLength = view.getUint32(8, true);
		const header = JSON.parse(
			new TextDecoder().decode(bytes.subarray(INDEX_HEADER_BYTES, INDEX_HEADER_BYTES + jsonLength))
		) as ChunkIndexHeader;
		let at = INDEX_HEADER_BYTES + align8(jsonLength);
		const K = view.getUint32(at, true);
		const S = view.getUint32(at + 4, true);
		const C = view.getUint32(at + 8, true);
		at += 16;
		// Each section copied out, so the arrays are aligned and independent of `bytes`.
		const take = <T>(Type: { new (b: ArrayBuffer): T; BYTES_PER_ELEMENT: number }, n: number) => {
			const size = n * Type.BYTES_PER_ELEMENT;
			if (at + size > bytes.byteLength)
				throw new Error('stored capture index is damaged: cut short');
			const copy = bytes.slice(at, at + size).buffer;
			at += align8(size);
			return new Type(copy);
		};
		const keyId = take(Uint32Array, K);
		const keyExtended = take(Uint8Array, K);
		const segmentFrames = take(Uint32Array, S);
		const segmentMinTime = take(Float64Array, S);
		const segmentMaxTime = take(Float64Array, S);
		const keyChunkStart = take(Uint32Array, K + 1);
		const chunkSegment = take(Uint32Array, C);
		const chunkFrames = take(Uint32Array, C);
		const chunkOffset = take(Uint32Array, C);
		const chunkBytes = take(Uint32Array, C);
		const chunkMinTime = take(Float64Array, C);
		const chunkMaxTime = take(Float64Array, C);
		return new ChunkIndex({
			header,
			keyId,
			keyExtended,
			segmentFrames,
			segmentMinTime,
			segmentMaxTime,
			keyChunkStart,
			chunkSegment,
			chunkFrames,
			chunkOffset,
			chunkBytes,
			chunkMinTime,
			chunkMaxTime
		});
	}
}

function ranksOf(keyChunkStart: Uint32Array, chunkFrames: Uint32Array): Float64Array {
	const rank = new Float64Array(chunkFrames.length);
	for (let k = 0; k + 1 < keyChunkStart.length; k++) {
		let before = 0;
		for (let c = keyChunkStart[k]; c < keyChunkStart[k + 1]; c++) {
			rank[c] = before;
			before += chunkFrames[c];
		}
	}
	return rank;
}

// ---------------------------------------------------------------- writer

export interface ChunkStoreWriterOptions {
	segmentFrames?: number;
	/** Receives each finished segment (number, bytes) while frames keep arriving; store it or queue it. */
	onSegment: (segment: number, bytes: Uint8Array) => void;
}

/**
 * A FrameSink that cuts the frames into segments as they arrive and hands each finished segment to
 * `onSegment`; `finish()` hands over the last one and returns the index. Holds one segment at a time.
 */
export class ChunkStoreWriter implements FrameSink {
	readonly segmentFrames: number;
	#onSegment: ChunkStoreWriterOptions['onSegment'];
	#n = 0;
	#time: Float64Array;
	#key: Uint32Array;
	#flags: Uint8Array;
	#length: Uint8Array;
	#dataOffset: Uint32Array;
	#data: Uint8Array;
	#dataBytes = 0;
	#kind: Uint8Array;
	#direction: Uint8Array;
	#bus: Uint8Array;
	#tag: Uint16Array;
	#keyOf = new Map<number, number>();
	/** Standard IDs' keys by ID (the common case, without a Map lookup per frame). */
	#standardKey = new Int32Array(0x800).fill(-1);
	#keyIds: number[] = [];
	#keyExtended: number[] = [];
	#segments: { frames: number; minTime: number; maxTime: number }[] = [];
	/** Per key, its chunks so far: [segment, frames, offset, bytes, minTime, maxTime] flattened. */
	#chunksOfKey: number[][] = [];
	#frameCount = 0;
	#minTime = Infinity;
	#maxTime = -Infinity;
	#segMin = Infinity;
	#segMax = -Infinity;

	constructor(options: ChunkStoreWriterOptions) {
		const w = options.segmentFrames ?? DEFAULT_SEGMENT_FRAMES;
		if (!Number.isInteger(w) || w < 1) throw new RangeError('segmentFrames must be at least 1');
		this.segmentFrames = w;
		this.#onSegment = options.onSegment;
		this.#time = new Float64Array(w);
		this.#key = new Uint32Array(w);
		this.#flags = new Uint8Array(w);
		this.#length = new Uint8Array(w);
		this.#dataOffset = new Uint32Array(w);
		this.#data = new Uint8Array(Math.min(w, 1 << 16) * 8);
		this.#kind = new Uint8Array(w);
		this.#direction = new Uint8Array(w);
		this.#bus = new Uint8Array(w);
		this.#tag = new Uint16Array(w);
	}

	get frameCount(): number {
		return this.#frameCount;
	}

	add(
		time: number,
		id: number,
		extended: boolean,
		data: Uint8Array,
		length: number,
		extras?: FrameExtras
	): void {
		let key = !extended && (id & 0x7ff) === id ? this.#standardKey[id] : -1;
		if (key < 0) key = this.#keyOf.get(keyCode(id, extended)) ?? -1;
		if (key < 0) {
			const code = keyCode(id, extended);
			key = this.#keyIds.length;
			this.#keyOf.set(code, key);
			if (!extended && (id & 0x7ff) === id) this.#standardKey[id] = key;
			this.#keyIds.push(id);
			this.#keyExtended.push(extended ? 1 : 0);
			this.#chunksOfKey.push([]);
		}
		const i = this.#n;
		if (this.#dataBytes + length > this.#data.length) {
			const next = new Uint8Array(Math.max(this.#data.length * 2, this.#dataBytes + length));
			next.set(this.#data.subarray(0, this.#dataBytes));
			this.#data = next;
		}
		this.#time[i] = time;
		this.#key[i] = key;
		this.#flags[i] =
			(extended ? FLAG_EXTENDED : 0) |
			(length > 8 ? FLAG_FD : 0) |
			(extras?.bitRateSwitch ? FLAG_BRS : 0);
		this.#length[i] = length;
		this.#dataOffset[i] = this.#dataBytes;
		const pool = this.#data;
		const at = this.#dataBytes;
		for (let k = 0; k < length; k++) pool[at + k] = data[k];
		this.#dataBytes += length;
		this.#kind[i] = extras?.kind ?? 0;
		this.#direction[i] = extras?.direction ?? 0;
		this.#bus[i] = extras?.bus ?? 0;
		this.#tag[i] = extras?.tag ?? 0;
		if (time < this.#segMin) this.#segMin = time;
		if (time > this.#segMax) this.#segMax = time;
		this.#n = i + 1;
		this.#frameCount++;
		if (this.#n === this.segmentFrames) this.#flush();
	}

	#flush(): void {
		const n = this.#n;
		if (n === 0) return;
		const segment = this.#segments.length;
		const { bytes, chunks } = encodeSegment(n, this.#keyIds.length, {
			time: this.#time,
			key: this.#key,
			flags: this.#flags,
			length: this.#length,
			dataOffset: this.#dataOffset,
			data: this.#data,
			kind: this.#kind,
			direction: this.#direction,
			bus: this.#bus,
			tag: this.#tag
		});
		for (const c of chunks)
			this.#chunksOfKey[c.key].push(segment, c.frames, c.offset, c.bytes, c.minTime, c.maxTime);
		this.#segments.push({ frames: n, minTime: this.#segMin, maxTime: this.#segMax });
		if (this.#segMin < this.#minTime) this.#minTime = this.#segMin;
		if (this.#segMax > this.#maxTime) this.#maxTime = this.#segMax;
		this.#segMin = Infinity;
		this.#segMax = -Infinity;
		this.#n = 0;
		this.#dataBytes = 0;
		this.#onSegment(segment, bytes);
	}

	/** Hands over the last segment and returns the index. */
	finish(origin: ChunkStoreOrigin, names: { buses?: string[]; tags?: string[] } = {}): ChunkIndex {
		this.#flush();
		const K = this.#keyIds.length;
		let C = 0;
		for (const list of this.#chunksOfKey) C += list.length / 6;
		const keyChunkStart = new Uint32Array(K + 1);
		const chunkSegment = new Uint32Array(C);
		const chunkFrames = new Uint32Array(C);
		const chunkOffset = new Uint32Array(C);
		const chunkBytes = new Uint32Array(C);
		const chunkMinTime = new Float64Array(C);
		const chunkMaxTime = new Float64Array(C);
		let c = 0;
		this.#chunksOfKey.forEach((list, k) => {
			keyChunkStart[k] = c;
			for (let p = 0; p < list.length; p += 6, c++) {
				chunkSegment[c] = list[p];
				chunkFrames[c] = list[p + 1];
				chunkOffset[c] = list[p + 2];
				chunkBytes[c] = list[p + 3];
				chunkMinTime[c] = list[p + 4];
				chunkMaxTime[c] = list[p + 5];
			}
		});
		keyChunkStart[K] = c;
		return new ChunkIndex({
			header: {
				format: 'framewright-chunks@1',
				segmentFrames: this.segmentFrames,
				frameCount: this.#frameCount,
				origin,
				minTime: this.#frameCount ? this.#minTime : 0,
				maxTime: this.#frameCount ? this.#maxTime : 0,
				buses: names.buses ?? [''],
				tags: names.tags ?? []
			},
			keyId: Uint32Array.from(this.#keyIds),
			keyExtended: Uint8Array.from(this.#keyExtended),
			segmentFrames: Uint32Array.from(this.#segments, (s) => s.frames),
			segmentMinTime: Float64Array.from(this.#segments, (s) => s.minTime),
			segmentMaxTime: Float64Array.from(this.#segments, (s) => s.maxTime),
			keyChunkStart,
			chunkSegment,
			chunkFrames,
			chunkOffset,
			chunkBytes,
			chunkMinTime,
			chunkMaxTime
		});
	}
}
