/**
 * The frames table of a capture: pages of received frames (optionally one ID only) and one frame
 * decoded signal by signal with the core's reference codec, so the table shows exactly what the
 * map says, labels included. Read from the chunked store a segment at a time (a page or one frame
 * is cheap work, done on the server thread).
 */
import type { ChunkSource } from '../../can/capture/chunked-decode';
import type { FrameColumns } from '../../can/capture/frame-columns';
import { FLAG_EXTENDED, FRAME_DIRECTION } from '../../can/capture/frame-store';
import { decodeFrame } from '../../can/codec';
import type { CompiledMap } from '../../can/decoder';
import type {
	FrameDetail,
	FrameRow,
	FrameSignalRow,
	FramesQuery,
	FramesResponse
} from '../../api/capture-views';
import { Problem } from '../problem';
import type { Services } from '../services';
import { openChunkSource, splitBusKey } from './capture-store';
import { captureIndexKey, compiledOf, openDecode, requireReadyCapture } from './decoding';

const HEX = Array.from({ length: 256 }, (_, b) => b.toString(16).toUpperCase().padStart(2, '0'));

function frameRow(
	c: FrameColumns & { readonly bus?: Uint8Array; readonly direction?: Uint8Array },
	i: number,
	index: number
): FrameRow {
	let dataHex = '';
	for (let k = 0, at = c.dataOffset[i]; k < c.length[i]; k++)
		dataHex += (k ? ' ' : '') + HEX[c.data[at + k]];
	return {
		index,
		time: c.time[i],
		id: c.id[i],
		extended: (c.flags[i] & FLAG_EXTENDED) !== 0,
		length: c.length[i],
		dataHex,
		bus: c.bus ? c.bus[i] : 0,
		direction: c.direction && c.direction[i] === FRAME_DIRECTION.tx ? 'tx' : 'rx'
	};
}

/**
 * One page of frames in capture order; `total` counts every frame the filter lets through. Only
 * the segments the page falls in are read: frame i is at position i mod segmentFrames of segment
 * i ÷ segmentFrames, and with an ID filter the index tells how many of its frames each segment holds.
 */
async function listFrames(
	source: ChunkSource,
	query: Pick<FramesQuery, 'offset' | 'limit' | 'id' | 'extended'>
): Promise<FramesResponse> {
	const { index } = source;
	const { offset, limit, id, extended } = query;
	const W = index.header.segmentFrames;
	const frames: FrameRow[] = [];
	if (id === undefined) {
		const end = Math.min(index.header.frameCount, offset + limit);
		for (let i = offset; i < end;) {
			const s = Math.floor(i / W);
			const c = (await source.segment(s)).columns();
			for (let p = i - s * W; p < c.count && i < end; p++, i++) frames.push(frameRow(c, p, i));
		}
		return { total: index.header.frameCount, frames };
	}
	const keys = [false, true]
		.filter((e) => extended === undefined || extended === e)
		.map((e) => index.keyOf(id, e))
		.filter((k) => k >= 0);
	// Frames of the filter per segment, in segment order.
	const perSegment = new Map<number, number>();
	let total = 0;
	for (const k of keys)
		for (let c = index.keyChunkStart[k]; c < index.keyChunkStart[k + 1]; c++) {
			const s = index.chunkSegment[c];
			perSegment.set(s, (perSegment.get(s) ?? 0) + index.chunkFrames[c]);
			total += index.chunkFrames[c];
		}
	let skip = offset;
	for (const s of [...perSegment.keys()].sort((a, b) => a - b)) {
		if (frames.length >= limit) break;
		const n = perSegment.get(s)!;
		if (skip >= n) {
			skip -= n;
			continue;
		}
		const c = (await source.segment(s)).columns();
		for (let p = 0; p < c.count && frames.length < limit; p++) {
			if (c.id[p] !== id) continue;
			if (extended !== undefined && ((c.flags[p] & FLAG_EXTENDED) !== 0) !== extended) continue;
			if (skip > 0) skip--;
			else frames.push(frameRow(c, p, s * W + p));
		}
	}
	return { total, frames };
}

async function frameDetail(
	source: ChunkSource,
	compiled: CompiledMap,
	index: number
): Promise<FrameDetail> {
	const count = source.index.header.frameCount;
	if (index >= count) {
		throw new Problem(
			404,
			`This capture has ${count} frames (index 0–${count - 1}); there is no frame ${index}.`
		);
	}
	const W = source.index.header.segmentFrames;
	const s = Math.floor(index / W);
	const c = (await source.segment(s)).columns();
	const p = index - s * W;
	const row = frameRow(c, p, index);
	const definition = compiled.lookup(row.id, row.extended);
	if (!definition) return { frame: { ...row, frameName: null }, signals: [] };
	const results = decodeFrame(
		definition.frame,
		c.data.subarray(c.dataOffset[p], c.dataOffset[p] + c.length[p])
	);
	const signals = definition.frame.signals.map((signal, k): FrameSignalRow => {
		const r = results[k];
		if (!r.present)
			return {
				name: signal.name,
				raw: null,
				value: null,
				unit: signal.unit,
				label: null,
				present: false,
				inRange: null,
				role: signal.role
			};
		return {
			name: signal.name,
			raw: typeof r.raw === 'bigint' ? r.raw.toString() : r.raw,
			value: Number.isFinite(r.value) ? r.value : null,
			unit: signal.unit,
			label: r.label,
			present: true,
			inRange: r.inRange,
			role: signal.role
		};
	});
	return { frame: { ...row, frameName: definition.frame.name }, signals };
}

/** A page of a processed capture's frames. */
export async function captureFrames(
	services: Services,
	workspaceId: string,
	captureId: string,
	query: FramesQuery
): Promise<FramesResponse> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const indexKey = await captureIndexKey(services, capture);
	return listFrames(await openChunkSource(services.storage, indexKey), query);
}

/** Frame `index` of a capture with its signals as the map of decode `decode` reads them. */
export async function decodedFrame(
	services: Services,
	workspaceId: string,
	captureId: string,
	query: { index: number; decode: string }
): Promise<FrameDetail> {
	const open = await openDecode(services, workspaceId, captureId, query.decode);
	// Frame numbers count every bus's frames, whichever bus the decode read.
	const source = await openChunkSource(services.storage, splitBusKey(open.indexKey).indexKey);
	return frameDetail(source, await compiledOf(open), query.index);
}
