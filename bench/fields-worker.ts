/**
 * Field proposals end to end in the capture worker pool (`npx tsx bench/fields-worker.ts`; part of
 * `npm run bench`). Prints figures only; nothing here asserts a timing.
 *
 * Workload: bench/fields.ts's capture (1,000,000 frames, 40 IDs, planted fields) written into the
 * chunked store in local blob storage in a temporary folder, as processing writes it (segments of
 * the default size, the index last). Timed:
 *  1. the `fields` task for one ID (opening an unknown ID on the page) in the interactive pool, as
 *     the server sends it: first on its thread (JIT still cold), then for another ID;
 *  2. the `fields` task for every ID, as the correlation asks for all unknown IDs: the pool's
 *     dispatch, ranged reads of each ID's chunks, proposeFields and the answer's copy back — first
 *     time, then again; and the one-ID task again;
 *  3. the `correlate` task: ID 0x100's little-endian value (bits 8–23) decoded as a channel through a
 *     map (physical = raw × 0.5 + 10), against every value proposal of the capture.
 * The server's cache of answers (field-proposal-cache.ts) is not involved: reopening an ID the server
 * has answered costs one Map lookup.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ChunkStoreWriter } from '../src/lib/can/capture/chunk-store';
import { candidatesFromProposals, type IdProposals } from '../src/lib/can/fields';
import { canMapSchema } from '../src/lib/can/map';
import { captureKeys, segmentKey } from '../src/lib/server/captures/capture-store';
import { closeCaptureWorkers, runCaptureTask } from '../src/lib/server/captures/pool';
import { bundleCaptureWorker } from '../src/lib/server/captures/worker-bundle';
import type { CorrelateOutcome, FieldsOutcome } from '../src/lib/server/captures/work/tasks';
import { createLocalStorage } from '../src/lib/server/storage';
import { buildCapture, IDS } from './field-capture';

async function* single(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	yield bytes;
}

const seconds = (from: number) => (performance.now() - from) / 1000;
const f3 = (s: number) => `${s.toFixed(3)} s`;

async function main() {
	const dir = mkdtempSync(join(tmpdir(), 'fw-fields-bench-'));
	// Inside the project, so its package imports resolve (as build/capture-worker.mjs does).
	const workerFile = join(
		import.meta.dirname,
		'..',
		'node_modules',
		'.cache',
		'framewright',
		`bench-fields-worker-${process.pid}.mjs`
	);
	try {
		process.env.FW_CAPTURE_WORKER = workerFile;
		await bundleCaptureWorker(workerFile);
		const storage = createLocalStorage({ root: join(dir, 'storage'), maxBytes: 8 * 1024 ** 3 });
		const keys = captureKeys('bench', 'fields');

		let t = performance.now();
		const writes: Promise<unknown>[] = [];
		const writer = new ChunkStoreWriter({
			onSegment: (s, bytes) =>
				writes.push(storage.put(segmentKey(keys.storeFolder, s), single(bytes)))
		});
		buildCapture(writer);
		const index = writer.finish({ timeOrigin: 0, epoch: false });
		await Promise.all(writes);
		await storage.put(keys.index, single(index.toBytes()));
		console.log(
			`Field proposals in the worker pool: ${index.header.frameCount.toLocaleString('en')} frames, ${IDS} IDs, ${index.segmentCount} segments (store written in ${f3(seconds(t))}, not timed below)`
		);

		const ids = Array.from({ length: IDS }, (_, k) => ({ id: 0x100 + k, extended: false }));
		const fields = () =>
			runCaptureTask<FieldsOutcome>({
				kind: 'fields',
				storage: storage.settings,
				indexKey: keys.index,
				ids
			});
		// One ID goes to the interactive pool, as the server sends it (field-proposals.ts).
		const oneId = (k: number) =>
			runCaptureTask<FieldsOutcome>(
				{ kind: 'fields', storage: storage.settings, indexKey: keys.index, ids: [ids[k]] },
				{ interactive: true }
			);
		t = performance.now();
		await oneId(7);
		console.log(
			`  fields task, one ID (25,000 frames), interactive pool, first task of its thread: ${f3(seconds(t))}`
		);
		t = performance.now();
		await oneId(8);
		console.log(`  fields task, another ID, interactive pool: ${f3(seconds(t))}`);
		t = performance.now();
		const proposals: IdProposals[] = await fields();
		console.log(`  fields task, every ID, first time: ${f3(seconds(t))}`);
		t = performance.now();
		await fields();
		console.log(`  fields task, every ID, again: ${f3(seconds(t))}`);

		const map = canMapSchema.parse({
			format: 'framewright-map@1',
			name: 'Bench',
			frames: [
				{
					name: 'Known',
					id: 0x100,
					signals: [{ name: 'Speed', startBit: 8, length: 16, scale: 0.5, offset: 10 }]
				}
			]
		});
		const candidates = proposals.flatMap((p) => candidatesFromProposals(p, p.fields));
		t = performance.now();
		const outcome = await runCaptureTask<CorrelateOutcome>({
			kind: 'correlate',
			storage: storage.settings,
			indexKey: keys.index,
			map,
			folder: `${keys.decodes}bench/`,
			channel: 0,
			candidates,
			maxPoints: 1000,
			top: 20
		});
		const best = outcome.ranking[0];
		console.log(
			`  correlate task, one channel against ${candidates.length} candidate fields: ${f3(seconds(t))}; best 0x${best.field.id.toString(16)} bits ${best.field.startBit}/${best.field.length} r = ${best.pearson?.toFixed(6)}, scale ${best.scale?.toPrecision(6)}, offset ${best.offset?.toPrecision(6)}, ${outcome.scatter.raw.length} scatter points`
		);
		console.log(
			`  peak resident memory (server and workers): ${Math.round(process.resourceUsage().maxRSS / 1024)} MB`
		);
	} finally {
		await closeCaptureWorkers();
		rmSync(dir, { recursive: true, force: true });
		rmSync(workerFile, { force: true });
	}
}

void main();
