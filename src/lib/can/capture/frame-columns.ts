/**
 * The column view every capture pass reads (ID statistics, bus load, J1939, channel decoding,
 * exports): frames in capture order as typed arrays plus one payload pool. The whole-capture
 * FrameStore is one; a segment of the chunked store (chunk-store.ts) rebuilt in capture order is
 * another, so the same passes run over a capture of any size one segment at a time.
 */
export interface FrameColumns {
	readonly count: number;
	/** Seconds from the capture's first frame. */
	readonly time: Float64Array;
	readonly id: Uint32Array;
	/** FLAG_EXTENDED | FLAG_FD | FLAG_BRS (frame-store.ts). */
	readonly flags: Uint8Array;
	/** Payload bytes, 0–64. */
	readonly length: Uint8Array;
	/** Frame i's payload is `data[dataOffset[i] … dataOffset[i] + length[i])`. */
	readonly dataOffset: Uint32Array;
	readonly data: Uint8Array;
}

/** Frame i's payload as a view (no copy). */
export function payloadOf(columns: FrameColumns, i: number): Uint8Array {
	const start = columns.dataOffset[i];
	return columns.data.subarray(start, start + columns.length[i]);
}
