/**
 * The first decode of a capture with a map, in capture workers: one pass over the segments
 * (chunked-decode.ts) gives every figure of the summary and a min/max pyramid per channel. Both are
 * stored in the decode's folder — the pyramids in one file per part, then `summary.json`, whose
 * presence means the decode is complete — so a decode is never computed twice, not even after a
 * restart.
 *
 * A large capture is decoded in as many parts as the pool has workers (runDecodePart, planned by
 * planDecodeParts): part 0 takes the bus figures (ID survey, bus load, J1939), the map's frames are
 * shared out, and each part writes the pyramids of its channels to `pyramids-<part>.fwcp`.
 * mergeDecodeParts then joins the parts' small figures into the one summary a single pass gives
 * (decode.test.ts compares them).
 */
import { threadId } from 'node:worker_threads';
import {
	decodeChunked,
	decodeChunkedPart,
	planDecodeParts,
	type ChunkedDecodingPart
} from '../../../can/capture/chunked-decode';
import { pyramidBytes, pyramidToBytes, type Pyramid } from '../../../can/capture/pyramid';
import { compileMap } from '../../../can/decoder';
import type { CanMap } from '../../../can/map';
import type { BlobStorage } from '../../storage/storage';
import { openChunkSource } from '../capture-store';
import { summarizeDecoding } from '../decode-summary';
import type { DecodePartOutcome, StoredDecode } from './tasks';

export const summaryKey = (folder: string) => `${folder}summary.json`;
/** The pyramids of a decode, or of one part of a split decode. */
export const pyramidsKey = (folder: string, part?: number) =>
	part === undefined ? `${folder}pyramids.fwcp` : `${folder}pyramids-${part}.fwcp`;

async function* pieces(parts: Uint8Array[]): AsyncGenerator<Uint8Array> {
	yield* parts;
}

interface DecodeTaskFields {
	indexKey: string;
	map: CanMap;
	folder: string;
}

/** Stored size of a pyramid (pyramidToBytes: header, one length per level, 40 bytes a node). */
const storedSize = (p: Pyramid) => 16 + 8 * p.levels.length + pyramidBytes(p);

/**
 * Writes the pyramids of the given channels (others get an empty range); returns each channel's
 * entry. Each pyramid is turned into bytes only when the storage asks for it, and let go once
 * written, so memory never holds every pyramid twice.
 */
async function storePyramids(
	storage: BlobStorage,
	key: string,
	decoding: Pick<ChunkedDecodingPart, 'channels' | 'pyramids'>,
	owned: (k: number) => boolean,
	part?: number
): Promise<StoredDecode['channels']> {
	const pyramids = decoding.pyramids;
	let offset = 0;
	const entries = decoding.channels.map((c, k) => {
		const entry = {
			firstTime: c.firstTime,
			lastTime: c.lastTime,
			pyramidOffset: offset,
			pyramidBytes: owned(k) ? storedSize(pyramids[k]) : 0,
			...(part === undefined ? {} : { pyramidPart: part })
		};
		offset += entry.pyramidBytes;
		return entry;
	});
	async function* bytes(): AsyncGenerator<Uint8Array> {
		for (let k = 0; k < pyramids.length; k++) {
			if (!owned(k)) continue;
			const out = pyramidToBytes(pyramids[k]);
			pyramids[k] = { count: 0, levels: [] };
			yield out;
		}
	}
	await storage.put(key, bytes());
	return entries;
}

function storeSummary(
	storage: BlobStorage,
	folder: string,
	stored: StoredDecode
): Promise<unknown> {
	return storage.put(
		summaryKey(folder),
		pieces([new TextEncoder().encode(JSON.stringify(stored))])
	);
}

/** The whole first decode in this worker (small captures, or a pool of one). */
export async function runDecode(
	storage: BlobStorage,
	task: DecodeTaskFields
): Promise<StoredDecode> {
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const decoding = await decodeChunked(source, compileMap(task.map));
	const stored: StoredDecode = {
		format: 'framewright-decode@1',
		summary: summarizeDecoding(decoding),
		channels: await storePyramids(storage, pyramidsKey(task.folder), decoding, () => true)
	};
	await storeSummary(storage, task.folder, stored);
	return stored;
}

/**
 * Part `part` of `parts` of a split first decode. Every part plans the split the same way from the
 * capture's index, so the server thread only says which part is whose. A part the plan leaves
 * empty (a map of fewer frames than workers) answers with nothing to merge.
 */
export async function runDecodePart(
	storage: BlobStorage,
	task: DecodeTaskFields & { part: number; parts: number }
): Promise<DecodePartOutcome | null> {
	const source = await openChunkSource(storage, task.indexKey, { cache: false });
	const compiled = compileMap(task.map);
	const plan = planDecodeParts(source.index, compiled, task.parts)[task.part];
	if (!plan) return null;
	const decoding = await decodeChunkedPart(source, compiled, plan);
	const mine = new Uint8Array(compiled.channels.length);
	for (const f of decoding.frames) {
		const frame = compiled.frames[f];
		mine.fill(1, frame.channelStart, frame.channelStart + frame.channelCount);
	}
	const noBus = {
		ids: [],
		unknownIds: [],
		busLoad: {
			bitrate: compiled.map.bitrate,
			dataBitrate: compiled.map.bitrate,
			bitRateSwitch: false,
			windowSeconds: 0,
			windows: [],
			meanPercent: 0,
			peakPercent: 0,
			fdFrames: 0
		},
		j1939: null
	};
	return {
		part: task.part,
		threadId,
		bus: decoding.bus !== null,
		owned: [...mine.keys()].filter((k) => mine[k] === 1),
		summary: summarizeDecoding({ ...decoding, ...(decoding.bus ?? noBus) }),
		channels: await storePyramids(
			storage,
			pyramidsKey(task.folder, task.part),
			decoding,
			(k) => mine[k] === 1,
			task.part
		)
	};
}

/**
 * The parts of a split decode joined into what a single pass stores (the bus figures from the bus
 * part, each channel from the part that decoded it), and stored. Small figures only: the pyramids
 * are already in storage, so this is cheap enough for the server thread.
 */
export async function mergeDecodeParts(
	storage: BlobStorage,
	folder: string,
	outcomes: readonly (DecodePartOutcome | null)[]
): Promise<StoredDecode> {
	const parts = outcomes.filter((o): o is DecodePartOutcome => o !== null);
	const bus = parts.find((p) => p.bus);
	if (!bus) throw new Error('a split decode lacks the part with the bus figures');
	const owner = new Map<number, DecodePartOutcome>();
	for (const p of parts) for (const k of p.owned) owner.set(k, p);
	const from = (k: number) => owner.get(k) ?? bus;
	const stored: StoredDecode = {
		format: 'framewright-decode@1',
		summary: {
			...bus.summary,
			channels: bus.summary.channels.map((_, k) => from(k).summary.channels[k])
		},
		channels: bus.channels.map((_, k) => from(k).channels[k])
	};
	await storeSummary(storage, folder, stored);
	return stored;
}
