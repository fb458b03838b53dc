/**
 * One decoded channel over a window, in a capture worker. A window with few samples is decoded from
 * the chunks of the channel's identifier and min/max-decimated exactly (decimate.ts), as before the
 * chunked store; a wider one is answered from the channel's stored pyramid (pyramid.ts), reading a
 * bounded number of nodes whatever the capture's length.
 */
import { channelSamples } from '../../../can/capture/chunked-decode';
import { decimateMinMax } from '../../../can/capture/decimate';
import {
	nodesInWindow,
	pyramidBytes,
	pyramidFromBytes,
	queryPyramid,
	samplesAround,
	type Pyramid
} from '../../../can/capture/pyramid';
import { compileMap, type CompiledMap } from '../../../can/decoder';
import type { CanMap } from '../../../can/map';
import type { BlobStorage } from '../../storage/storage';
import { byteCache, openChunkSource } from '../capture-store';
import { pyramidsKey } from './decode';
import type { SeriesOutcome, SeriesTask } from './tasks';

/** Samples decoded straight from the chunks at most (a few ms of decoding). */
const rawLimit = (points: number) => Math.max(1 << 16, 32 * points);

const pyramids = byteCache<Pyramid>(64 * 1024 * 1024, (p) => pyramidBytes(p) + 64);
const compiledMaps = byteCache<CompiledMap>(
	16 * 1024 * 1024,
	(c) => 10_000 + 500 * c.channels.length
);

export function compiledFor(folder: string, map: CanMap): Promise<CompiledMap> {
	return compiledMaps.get(folder, async () => compileMap(map));
}

export function loadPyramid(
	storage: BlobStorage,
	task: Pick<
		SeriesTask,
		'folder' | 'channel' | 'pyramidOffset' | 'pyramidBytes' | 'pyramidPart' | 'storage'
	>
): Promise<Pyramid> {
	const id = JSON.stringify(task.storage);
	return pyramids.get(`${id}|${task.folder}${task.channel}`, async () =>
		pyramidFromBytes(
			await storage.getRange(
				pyramidsKey(task.folder, task.pyramidPart),
				task.pyramidOffset,
				task.pyramidBytes
			)
		)
	);
}

export async function runSeries(storage: BlobStorage, task: SeriesTask): Promise<SeriesOutcome> {
	const pyramid = await loadPyramid(storage, task);
	const { from, to, points } = task;
	let d;
	if (samplesAround(pyramid, from, to) <= rawLimit(points)) {
		// Whole chunks from one node before the window to one after, so the nearest samples outside
		// it (drawn to the plot's edges) come along.
		let lo = -Infinity;
		let hi = Infinity;
		if (pyramid.levels.length > 0) {
			const first = pyramid.levels[0].first;
			const [k0, k1] = nodesInWindow(pyramid, 0, from, to);
			if (k0 > 0) lo = first[k0 - 1];
			if (k1 + 1 < first.length) hi = first[k1 + 1];
		}
		const source = await openChunkSource(storage, task.indexKey);
		const compiled = await compiledFor(task.folder, task.map);
		const samples = await channelSamples(source, compiled, task.channel, lo, hi);
		d = decimateMinMax(samples.time, samples.value, from, to, points);
	} else {
		d = queryPyramid(pyramid, from, to, points);
	}
	return {
		time: Array.from(d.time),
		// ±Infinity (a float field can carry it) has no JSON form
		value: Array.from(d.value, (v) => (Number.isFinite(v) ? v : null)),
		decimated: !d.raw,
		samplesInRange: d.inRange
	};
}
