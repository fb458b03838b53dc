/**
 * Processing a stored capture CSV into the chunked frame store: the file is read from storage and
 * parsed chunk by chunk, and each finished segment is written while parsing goes on. Reading waits
 * while more than SEGMENT_WRITES_AHEAD segment writes are running, so memory holds a few segments
 * and one piece of text whatever the file's size.
 * Runs in a capture worker (and in-process for the small demo captures of the seed).
 */
import { threadId } from 'node:worker_threads';
import { ChunkStoreWriter } from '../../../can/capture/chunk-store';
import { originOf } from '../../../can/capture/clock';
import { CaptureFormatError } from '../../../can/capture/detect-layout';
import { FrameStore } from '../../../can/capture/frame-store';
import { ingestCaptureInto } from '../../../can/capture/ingest';
import type { CaptureLayout } from '../../../can/capture/layout';
import { byteChunks, type BlobStorage } from '../../storage/storage';
import { segmentKey } from '../capture-store';
import { GzipFormatError, plainBytes } from '../gzip';
import type { ProcessOutcome } from './tasks';

async function* single(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

/**
 * Segment writes that may be in flight while parsing goes on: storing a segment (a few MB, made
 * durable by the storage) then overlaps with parsing the next ones instead of stalling it, and
 * memory stays bounded by this many segments.
 */
export const SEGMENT_WRITES_AHEAD = 3;

/**
 * A ChunkStoreWriter that stores each segment; `drain(ahead)` waits until at most `ahead` writes are
 * still running (0: all done) and throws the first write's failure.
 */
function storingWriter(storage: BlobStorage, storeFolder: string, segmentFrames?: number) {
	const writes = new Set<Promise<void>>();
	let failure: unknown = null;
	const writer = new ChunkStoreWriter({
		segmentFrames,
		onSegment: (s, bytes) => {
			const write: Promise<void> = storage
				.put(segmentKey(storeFolder, s), single(bytes))
				.then(
					() => {},
					(error: unknown) => {
						failure ??= error;
					}
				)
				.finally(() => writes.delete(write));
			writes.add(write);
		}
	});
	const drain = async (ahead = 0) => {
		while (writes.size > ahead) await Promise.race(writes);
		if (failure !== null) throw failure;
	};
	const finish = async (
		origin: { timeOrigin: number; epoch: boolean },
		names?: { buses?: string[]; tags?: string[] }
	) => {
		const index = writer.finish(origin, names);
		await drain();
		const indexKey = `${storeFolder}index.fwci`;
		// The index last: its presence means every segment is stored.
		await storage.put(indexKey, single(index.toBytes()));
		return { index, indexKey };
	};
	return { writer, drain, finish };
}

export async function runProcess(
	storage: BlobStorage,
	task: { rawKey: string; layout: CaptureLayout; storeFolder: string; segmentFrames?: number },
	onProgress: (bytesRead: number) => void = () => {}
): Promise<ProcessOutcome> {
	const { writer, drain, finish } = storingWriter(storage, task.storeFolder, task.segmentFrames);
	let read = 0;
	async function* source(): AsyncGenerator<Uint8Array> {
		for await (const chunk of byteChunks(await storage.get(task.rawKey))) {
			// Back-pressure: no more text while more than a few finished segments are being stored.
			await drain(SEGMENT_WRITES_AHEAD);
			yield chunk;
			read += chunk.byteLength;
			onProgress(read);
		}
	}
	try {
		// A gzip upload is stored compressed: decompressed here as it is read (progress counts stored bytes).
		const report = await ingestCaptureInto(plainBytes(source()), writer, { layout: task.layout });
		const { index, indexKey } = await finish(
			{
				timeOrigin: report.timeOrigin ?? 0,
				epoch: report.layout.epochTime || report.layout.timeFormat === 'date-time'
			},
			// Without a bus column every frame is on the one unnamed bus (index 0).
			{ buses: report.buses.length > 0 ? report.buses : undefined, tags: report.tags }
		);
		return {
			ok: true,
			report: {
				frameCount: report.frameCount,
				lineCount: report.lineCount,
				badRows: report.badRows,
				badRowCount: report.badRowCount,
				warnings: report.warnings,
				layoutNotes: report.layoutNotes,
				buses: report.buses,
				hasDirection: report.layout.directionColumn !== null,
				origin: originOf(report.layout.timeFormat, report.layout.epochTime, report.timeOrigin)
			},
			frameCount: report.frameCount,
			// The latest frame time (times start at 0 with the first frame).
			durationS: Math.max(0, index.header.maxTime),
			indexKey,
			threadId
		};
	} catch (error) {
		await drain().catch(() => {});
		return {
			ok: false,
			formatError: error instanceof CaptureFormatError || error instanceof GzipFormatError,
			message: error instanceof Error ? error.message : String(error),
			threadId
		};
	}
}

/** Rewrites a store of earlier versions (one FrameStore blob) as a chunked store; returns the index key. */
export async function runConvert(
	storage: BlobStorage,
	task: { legacyKey: string; storeFolder: string }
): Promise<string> {
	const store = FrameStore.fromBytes(await storage.getBytes(task.legacyKey));
	const { writer, drain, finish } = storingWriter(storage, task.storeFolder);
	for (let i = 0; i < store.count; i++) {
		writer.add(store.time[i], store.id[i], store.isExtended(i), store.payload(i), store.length[i]);
		if (i % 65536 === 65535) await drain();
	}
	return (await finish(store.origin)).indexKey;
}
