/**
 * The frames table of a capture: pages of received frames (optionally one ID only) and one frame
 * decoded signal by signal with the core's reference codec, so the table shows exactly what the
 * map says, labels included.
 */
import { FLAG_EXTENDED, type FrameStore } from '../../can/capture/frame-store';
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
import { getDecoded, requireReadyCapture } from './decoding';
import { loadFrameStore } from './store';

const HEX = Array.from({ length: 256 }, (_, b) => b.toString(16).toUpperCase().padStart(2, '0'));

function frameRow(store: FrameStore, i: number): FrameRow {
	const payload = store.payload(i);
	let dataHex = '';
	for (let k = 0; k < payload.length; k++) dataHex += (k ? ' ' : '') + HEX[payload[k]];
	return {
		index: i,
		time: store.time[i],
		id: store.id[i],
		extended: (store.flags[i] & FLAG_EXTENDED) !== 0,
		length: payload.length,
		dataHex
	};
}

/** One page of frames in capture order; `total` counts every frame the filter lets through. */
function listFrames(
	store: FrameStore,
	query: Pick<FramesQuery, 'offset' | 'limit' | 'id' | 'extended'>
): FramesResponse {
	const { offset, limit, id, extended } = query;
	const frames: FrameRow[] = [];
	if (id === undefined) {
		for (let i = offset; i < Math.min(store.count, offset + limit); i++)
			frames.push(frameRow(store, i));
		return { total: store.count, frames };
	}
	// One pass over the ID column: cheap next to JSON (a few ms for a million frames).
	const ids = store.id;
	const flags = store.flags;
	let total = 0;
	for (let i = 0; i < store.count; i++) {
		if (ids[i] !== id) continue;
		if (extended !== undefined && ((flags[i] & FLAG_EXTENDED) !== 0) !== extended) continue;
		if (total >= offset && frames.length < limit) frames.push(frameRow(store, i));
		total++;
	}
	return { total, frames };
}

function frameDetail(store: FrameStore, compiled: CompiledMap, index: number): FrameDetail {
	if (index >= store.count) {
		throw new Problem(
			404,
			`This capture has ${store.count} frames (index 0–${store.count - 1}); there is no frame ${index}.`
		);
	}
	const row = frameRow(store, index);
	const definition = compiled.lookup(row.id, row.extended);
	if (!definition) return { frame: { ...row, frameName: null }, signals: [] };
	const results = decodeFrame(definition.frame, store.payload(index));
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
				inRange: null
			};
		return {
			name: signal.name,
			raw: typeof r.raw === 'bigint' ? r.raw.toString() : r.raw,
			value: Number.isFinite(r.value) ? r.value : null,
			unit: signal.unit,
			label: r.label,
			present: true,
			inRange: r.inRange
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
	return listFrames(await loadFrameStore(services, capture), query);
}

/** Frame `index` of a capture with its signals as the map of decode `decode` reads them. */
export async function decodedFrame(
	services: Services,
	workspaceId: string,
	captureId: string,
	query: { index: number; decode: string }
): Promise<FrameDetail> {
	const { store, compiled } = await getDecoded(services, workspaceId, captureId, query.decode);
	return frameDetail(store, compiled, query.index);
}
