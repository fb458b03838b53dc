/**
 * The frames of one identifier in the shape the field detectors read: times in seconds and the
 * payloads in one flat byte array with a fixed stride (the longest payload), plus each frame's
 * own length. `framesById` builds these from a capture's FrameStore in two passes.
 */
import { FLAG_EXTENDED, type FrameStore } from '../capture/frame-store';

export interface IdFrames {
	id: number;
	extended: boolean;
	count: number;
	/** Seconds from the capture's first frame, one per frame. */
	time: Float64Array;
	/** Payload bytes of each frame. */
	length: Uint8Array;
	/** Bytes reserved per frame in `data`: the longest payload of this ID. */
	stride: number;
	/** Frame i's payload is `data[i·stride … i·stride + length[i])`; bytes past its length are 0. */
	data: Uint8Array;
}

/** Frames of one ID from separate payloads (tests, small tools). */
export function idFramesFromPayloads(
	id: number,
	extended: boolean,
	time: ArrayLike<number>,
	payloads: readonly Uint8Array[]
): IdFrames {
	if (time.length !== payloads.length) {
		throw new RangeError(`${time.length} times but ${payloads.length} payloads`);
	}
	const count = payloads.length;
	const stride = payloads.reduce((max, p) => Math.max(max, p.length), 0);
	const data = new Uint8Array(count * stride);
	const length = new Uint8Array(count);
	payloads.forEach((p, i) => {
		data.set(p, i * stride);
		length[i] = p.length;
	});
	return { id, extended, count, time: Float64Array.from(time), length, stride, data };
}

const keyOf = (id: number, extended: boolean) => (extended ? id + 0x20000000 : id);

/**
 * Every ID of a capture (or those `select` keeps), sorted by (extended, id) like the ID survey.
 * Memory: one copy of the selected frames' times and payloads.
 */
export function framesById(
	store: FrameStore,
	select: (id: number, extended: boolean) => boolean = () => true
): IdFrames[] {
	const { id, flags, length, dataOffset, data, time } = store;
	interface Group {
		frames: IdFrames;
		fill: number;
	}
	// Pass 1: count frames and the longest payload per ID.
	const tally = new Map<number, { id: number; extended: boolean; count: number; stride: number }>();
	const keys = new Float64Array(store.count); // -1 = not selected
	for (let i = 0; i < store.count; i++) {
		const extended = (flags[i] & FLAG_EXTENDED) !== 0;
		const key = keyOf(id[i], extended);
		let t = tally.get(key);
		if (t === undefined) {
			// count −1 marks an ID that `select` left out.
			t = { id: id[i], extended, count: select(id[i], extended) ? 0 : -1, stride: 0 };
			tally.set(key, t);
		}
		if (t.count < 0) {
			keys[i] = -1;
			continue;
		}
		keys[i] = key;
		t.count++;
		if (length[i] > t.stride) t.stride = length[i];
	}
	// Pass 2: copy times and payloads into each ID's arrays.
	const groups = new Map<number, Group>();
	for (const [key, t] of tally) {
		if (t.count < 0) continue;
		groups.set(key, {
			fill: 0,
			frames: {
				id: t.id,
				extended: t.extended,
				count: t.count,
				time: new Float64Array(t.count),
				length: new Uint8Array(t.count),
				stride: t.stride,
				data: new Uint8Array(t.count * t.stride)
			}
		});
	}
	for (let i = 0; i < store.count; i++) {
		if (keys[i] < 0) continue;
		const g = groups.get(keys[i])!;
		const f = g.frames;
		const k = g.fill++;
		f.time[k] = time[i];
		f.length[k] = length[i];
		const from = dataOffset[i];
		const to = k * f.stride;
		for (let b = 0; b < length[i]; b++) f.data[to + b] = data[from + b];
	}
	return [...groups.values()]
		.map((g) => g.frames)
		.sort((a, b) => Number(a.extended) - Number(b.extended) || a.id - b.id);
}
