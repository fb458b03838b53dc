/**
 * A capture's frames in compact column form: one typed array per field and one byte pool for the
 * payloads. About 18 bytes per frame plus its payload, instead of a JS object per frame, so a
 * capture of millions of frames fits in memory and can be stored as one byte buffer and reopened
 * without parsing the CSV again.
 */

import type { FrameColumns } from './frame-columns';

/**
 * What a capture row may say about a frame beyond time, ID and payload. Today's CSV layouts carry
 * none of it, so every field has a default; the chunked store (chunk-store.ts) keeps a column for each.
 */
export interface FrameExtras {
	/** Index into the capture's bus names (default 0, the one unnamed bus). */
	bus?: number;
	direction?: FrameDirection;
	kind?: FrameKind;
	/** CAN FD bit-rate switch (BRS) seen on the bus. */
	bitRateSwitch?: boolean;
	/** Index into the capture's tag names + 1; 0 = no tag. */
	tag?: number;
}

/** Received or sent by the logger itself (0 = rx, 1 = tx). */
export const FRAME_DIRECTION = { rx: 0, tx: 1 } as const;
export type FrameDirection = (typeof FRAME_DIRECTION)[keyof typeof FRAME_DIRECTION];
/** A data frame, a remote request (no payload) or an error frame (ISO 11898-1). */
export const FRAME_KIND = { data: 0, remote: 1, error: 2 } as const;
export type FrameKind = (typeof FRAME_KIND)[keyof typeof FRAME_KIND];

/** Anything frames can be streamed into (the store itself, or a decoder that keeps nothing). */
export interface FrameSink {
	/** `time` in seconds from the first frame; copies `data[0 … length)`. */
	add(
		time: number,
		id: number,
		extended: boolean,
		data: Uint8Array,
		length: number,
		extras?: FrameExtras
	): void;
}

export const FLAG_EXTENDED = 1;
/** Payload longer than 8 bytes, which only CAN FD can carry (ISO 11898-1). */
export const FLAG_FD = 2;
/** A CAN FD frame sent with the faster data-phase bit rate (BRS bit, ISO 11898-1:2015). */
export const FLAG_BRS = 4;

const MAGIC = 0x53435746; // "FWCS" read as little-endian u32
const FORMAT_VERSION = 1;
/** magic u32, version u32, count u32, data bytes u32, time origin f64, epoch flag u32, reserved u32. */
const HEADER_BYTES = 32;

const INITIAL_CAPACITY = 1024;

function grow<T extends Float64Array | Uint32Array | Uint8Array>(array: T, minLength: number): T {
	let length = Math.max(array.length, 16);
	while (length < minLength) length *= 2;
	const next = new (array.constructor as new (n: number) => T)(length);
	next.set(array);
	return next;
}

const align8 = (n: number) => (n + 7) & ~7;

export interface FrameStoreOrigin {
	/** Seconds of the first frame as written in the file (epoch seconds when `epoch`). */
	timeOrigin: number;
	epoch: boolean;
}

export class FrameStore implements FrameSink, FrameColumns {
	#count = 0;
	#dataBytes = 0;
	#time = new Float64Array(INITIAL_CAPACITY);
	#id = new Uint32Array(INITIAL_CAPACITY);
	#flags = new Uint8Array(INITIAL_CAPACITY);
	#length = new Uint8Array(INITIAL_CAPACITY);
	#dataOffset = new Uint32Array(INITIAL_CAPACITY);
	#data = new Uint8Array(INITIAL_CAPACITY * 8);
	origin: FrameStoreOrigin = { timeOrigin: 0, epoch: false };

	get count(): number {
		return this.#count;
	}

	/** Views trimmed to the stored frames; valid until the next `add`. */
	get time(): Float64Array {
		return this.#time.subarray(0, this.#count);
	}
	get id(): Uint32Array {
		return this.#id.subarray(0, this.#count);
	}
	get flags(): Uint8Array {
		return this.#flags.subarray(0, this.#count);
	}
	get length(): Uint8Array {
		return this.#length.subarray(0, this.#count);
	}
	get dataOffset(): Uint32Array {
		return this.#dataOffset.subarray(0, this.#count);
	}
	/** The payload pool: frame i's bytes are `data[dataOffset[i] … dataOffset[i] + length[i])`. */
	get data(): Uint8Array {
		return this.#data.subarray(0, this.#dataBytes);
	}

	add(time: number, id: number, extended: boolean, data: Uint8Array, length: number): void {
		const i = this.#count;
		if (i === this.#time.length) {
			this.#time = grow(this.#time, i + 1);
			this.#id = grow(this.#id, i + 1);
			this.#flags = grow(this.#flags, i + 1);
			this.#length = grow(this.#length, i + 1);
			this.#dataOffset = grow(this.#dataOffset, i + 1);
		}
		if (this.#dataBytes + length > this.#data.length) {
			this.#data = grow(this.#data, this.#dataBytes + length);
		}
		this.#time[i] = time;
		this.#id[i] = id;
		this.#flags[i] = (extended ? FLAG_EXTENDED : 0) | (length > 8 ? FLAG_FD : 0);
		this.#length[i] = length;
		this.#dataOffset[i] = this.#dataBytes;
		// A byte loop: classical payloads are ≤ 8 bytes, where subarray + set would allocate a view per frame.
		const pool = this.#data;
		const at = this.#dataBytes;
		for (let k = 0; k < length; k++) pool[at + k] = data[k];
		this.#dataBytes += length;
		this.#count = i + 1;
	}

	isExtended(i: number): boolean {
		return (this.#flags[i] & FLAG_EXTENDED) !== 0;
	}

	/** Frame i's payload as a view into the pool (no copy). */
	payload(i: number): Uint8Array {
		const start = this.#dataOffset[i];
		return this.#data.subarray(start, start + this.#length[i]);
	}

	/**
	 * One buffer: a 32-byte header, then time, id, dataOffset, flags, length and the data pool,
	 * each section starting on an 8-byte boundary so it can be viewed in place.
	 */
	toBytes(): Uint8Array {
		const n = this.#count;
		const sizes = [n * 8, n * 4, n * 4, n, n, this.#dataBytes];
		const total = HEADER_BYTES + sizes.reduce((sum, s) => sum + align8(s), 0);
		const bytes = new Uint8Array(total);
		const view = new DataView(bytes.buffer);
		view.setUint32(0, MAGIC, true);
		view.setUint32(4, FORMAT_VERSION, true);
		view.setUint32(8, n, true);
		view.setUint32(12, this.#dataBytes, true);
		view.setFloat64(16, this.origin.timeOrigin, true);
		view.setUint32(24, this.origin.epoch ? 1 : 0, true);
		const sections = [this.time, this.id, this.dataOffset, this.flags, this.length, this.data];
		let at = HEADER_BYTES;
		sections.forEach((section, k) => {
			// Typed arrays are written as raw bytes; the header's magic number catches an endianness mismatch.
			bytes.set(new Uint8Array(section.buffer, section.byteOffset, sizes[k]), at);
			at += align8(sizes[k]);
		});
		return bytes;
	}

	static fromBytes(bytes: Uint8Array): FrameStore {
		if (bytes.byteLength < HEADER_BYTES) {
			throw new Error(`not a stored capture: ${bytes.byteLength} bytes is shorter than the header`);
		}
		const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
		if (view.getUint32(0, true) !== MAGIC)
			throw new Error('not a stored capture: wrong magic number');
		const version = view.getUint32(4, true);
		if (version !== FORMAT_VERSION) {
			throw new Error(
				`stored capture format ${version} is not supported (expected ${FORMAT_VERSION})`
			);
		}
		const n = view.getUint32(8, true);
		const dataBytes = view.getUint32(12, true);
		const sizes = [n * 8, n * 4, n * 4, n, n, dataBytes];
		const expected = HEADER_BYTES + sizes.reduce((sum, s) => sum + align8(s), 0);
		if (bytes.byteLength !== expected) {
			throw new Error(`stored capture is damaged: ${bytes.byteLength} bytes, expected ${expected}`);
		}
		// Copy each section out so the arrays are aligned and independent of the caller's buffer.
		let at = HEADER_BYTES;
		const take = (k: number) => {
			const copy = bytes.slice(at, at + sizes[k]);
			at += align8(sizes[k]);
			return copy.buffer;
		};
		const store = new FrameStore();
		store.#time = new Float64Array(take(0));
		store.#id = new Uint32Array(take(1));
		store.#dataOffset = new Uint32Array(take(2));
		store.#flags = new Uint8Array(take(3));
		store.#length = new Uint8Array(take(4));
		store.#data = new Uint8Array(take(5));
		store.#count = n;
		store.#dataBytes = dataBytes;
		store.origin = { timeOrigin: view.getFloat64(16, true), epoch: view.getUint32(24, true) === 1 };
		for (let i = 0; i < n; i++) {
			if (store.#length[i] > 64 || store.#dataOffset[i] + store.#length[i] > dataBytes) {
				throw new Error(`stored capture is damaged: frame ${i} points outside the payload pool`);
			}
		}
		return store;
	}
}
