// The chunked store's promises, through the routes as the server runs them: a decode survives a
// restart (stored, read back, never decoded twice), storage holds nothing orphaned after a capture or
// workspace is deleted (also while processing) or an upload is cut off, a long export does not block
// other requests, and a capture stored by an earlier version still opens.
import { rmSync, statSync } from 'node:fs';
import { mkdir, utimes, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, describe, expect, it } from 'vitest';
import { ingestCapture } from '$lib/can/capture/ingest';
import { CANONICAL_LAYOUT } from '$lib/can/capture/layout';
import type { SessionUser } from '$lib/server/guard';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	makeEvent,
	type TestServices
} from '$lib/server/test-support';
import type { DecodeResponse, FramesResponse, SeriesResponse } from '$lib/api/capture-views';
import { POST as decodeRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as decodesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decodes/[decodeId]/+server';
import { GET as framesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/frames/+server';
import { GET as seriesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/series/+server';
import { GET as statusRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/status/+server';
import { DELETE as deleteCaptureRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/+server';
import { DELETE as deleteWorkspaceRoute } from '../../../routes/api/workspaces/[ws]/+server';
import { GET as exportRoute } from '../../../routes/w/[ws]/captures/[id]/export/+server';
import { captureKeys, clearCaptureStoreCaches } from './capture-store';
import { forgetCaptureDecodes } from './decoding';
import { closeCaptureWorkers } from './pool';
import { importCaptureInProcess, processingDone, startProcessing } from './processing';
import { insertCapture } from './captures-db';

const clubRacer = fixtureMap('club-racer-ecu.map.json');
const sessionCsv = fixtureText('club-racer-session.csv');

const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

async function buildWorld() {
	const services = await createTestServices();
	worlds.push(services);
	const { workspace, users } = await createTeam(services.db, 'Scale team');
	const mapId = await createPublishedMap(services.db, {
		workspaceId: workspace.id,
		actorId: users.owner.id,
		revisions: [clubRacer]
	});
	const captureId = await importCaptureInProcess(services, {
		workspaceId: workspace.id,
		actorId: users.viewer.id,
		fileName: 'club-racer-session.csv',
		text: sessionCsv
	});
	return { services, workspace, users, mapId, captureId };
}
type World = Awaited<ReturnType<typeof buildWorld>>;

function event(
	w: World,
	user: SessionUser,
	routeId: string,
	init: { query?: string; body?: unknown; params?: Record<string, string>; method?: string } = {}
) {
	const params: Record<string, string> = { ws: w.workspace.slug, id: w.captureId, ...init.params };
	const path =
		routeId.replace(/\[(\w+)\]/g, (_, name: string) => params[name] ?? name) + (init.query ?? '');
	return makeEvent<RequestEvent>({
		services: w.services,
		user,
		routeId,
		params,
		path,
		body: init.body,
		method: init.method
	}) as never;
}

const API = '/api/workspaces/[ws]/captures/[id]';

async function decode(w: World): Promise<DecodeResponse> {
	const response = await decodeRoute(
		event(w, w.users.viewer, `${API}/decode`, { body: { mapId: w.mapId, revision: 1 } })
	);
	expect(response.status).toBe(200);
	return response.json();
}

async function series(w: World, decodeId: string, query: string): Promise<SeriesResponse> {
	const response = await seriesRoute(
		event(w, w.users.viewer, `${API}/series`, { query: `?decode=${decodeId}&${query}` })
	);
	expect(response.status).toBe(200);
	return response.json();
}

/** As after a restart: every cache of this process dropped and the worker threads ended. */
async function restart(w: World) {
	forgetCaptureDecodes(w.captureId);
	clearCaptureStoreCaches();
	await closeCaptureWorkers();
}

describe('a stored decode', () => {
	it('survives a restart: the same summary and series, read back without decoding again', async () => {
		const w = await buildWorld();
		const { decode: d, summary } = await decode(w);
		const folder = captureKeys(w.workspace.id, w.captureId).decodes;
		const stored = await w.services.storage.list(folder);
		expect(stored.map((k) => k.slice(k.lastIndexOf('/') + 1))).toEqual([
			'pyramids.fwcp',
			'summary.json'
		]);
		const written = stored.map((k) => statSync(join(w.services.storageRoot, k)).mtimeMs);
		const wide = await series(w, d.id, 'channel=0&points=40');
		const narrow = await series(w, d.id, 'channel=1&from=10&to=10.5&points=2000');

		await restart(w);
		const reopened = await decodesRoute(
			event(w, w.users.viewer, `${API}/decodes/[decodeId]`, { params: { decodeId: d.id } })
		);
		expect(((await reopened.json()) as DecodeResponse).summary).toEqual(summary);
		expect(await series(w, d.id, 'channel=0&points=40')).toEqual(wide);
		expect(await series(w, d.id, 'channel=1&from=10&to=10.5&points=2000')).toEqual(narrow);
		// Nothing was decoded or written again.
		expect(await w.services.storage.list(folder)).toEqual(stored);
		expect(stored.map((k) => statSync(join(w.services.storageRoot, k)).mtimeMs)).toEqual(written);
	});

	it('decodes again when its stored files are gone (the record is what counts)', async () => {
		const w = await buildWorld();
		const { decode: d, summary } = await decode(w);
		await w.services.storage.deletePrefix(captureKeys(w.workspace.id, w.captureId).decodes);
		await restart(w);
		const reopened = await decodesRoute(
			event(w, w.users.viewer, `${API}/decodes/[decodeId]`, { params: { decodeId: d.id } })
		);
		expect(((await reopened.json()) as DecodeResponse).summary).toEqual(summary);
	});
});

describe('storage after deletions and interruptions (nothing orphaned)', () => {
	it('deleting a decoded capture removes its upload, store and decodes', async () => {
		const w = await buildWorld();
		await decode(w);
		expect((await w.services.storage.list('')).length).toBeGreaterThan(3);
		const response = await deleteCaptureRoute(event(w, w.users.viewer, API, { method: 'DELETE' }));
		expect(response.status).toBe(204);
		expect(await w.services.storage.list('')).toEqual([]);
	});

	it('deleting a workspace removes every capture object, and stops a processing in flight', async () => {
		const w = await buildWorld();
		await decode(w);
		// A second capture, large enough to be still processing when the workspace goes.
		const big = Array.from(
			{ length: 300_000 },
			(_, i) => `${(i / 1000).toFixed(3)},123,0,2,AB CD`
		).join('\n');
		const second = await uploadRaw(w, 'big.csv', `time,id,extended,dlc,data\n${big}\n`);
		await startProcessing(w.services, {
			workspaceId: w.workspace.id,
			captureId: second,
			layout: CANONICAL_LAYOUT,
			actorId: w.users.owner.id
		});
		const response = await deleteWorkspaceRoute(
			event(w, w.users.owner, '/api/workspaces/[ws]', { method: 'DELETE' })
		);
		expect(response.status).toBe(204);
		await processingDone(second);
		expect(await w.services.storage.list('')).toEqual([]);
	});

	it('processing that ends after its capture was deleted discards its output', async () => {
		const w = await buildWorld();
		const id = await uploadRaw(w, 'late.csv', sessionCsv);
		await startProcessing(w.services, {
			workspaceId: w.workspace.id,
			captureId: id,
			layout: CANONICAL_LAYOUT,
			actorId: w.users.owner.id
		});
		// The row goes while the worker parses (as a workspace deletion's cascade does it).
		await w.services.db.deleteFrom('captures').where('id', '=', id).execute();
		await w.services.storage.delete(captureKeys(w.workspace.id, id).raw);
		await processingDone(id);
		expect(await w.services.storage.list(captureKeys(w.workspace.id, id).folder)).toEqual([]);
	});

	it('an upload cut off mid-stream leaves no temporary file once swept', async () => {
		const w = await buildWorld();
		const incoming = join(w.services.storageRoot, '.incoming');
		await mkdir(incoming, { recursive: true });
		// What `kill -9` during an upload leaves: a part file nobody writes to any more.
		const part = join(incoming, 'c0ffee.part');
		await writeFile(part, 'time,id,extended,dlc,data\n0.0,123,0,1,AB\n');
		const old = new Date(Date.now() - 2 * 3600_000);
		await utimes(part, old, old);
		expect(await w.services.storage.sweepIncomplete(60_000)).toBe(1);
		const { readdir } = await import('node:fs/promises');
		expect(await readdir(incoming)).toEqual([]);
	});
});

/** A capture uploaded (raw stored, row 'uploaded'), not yet processed. */
async function uploadRaw(w: World, name: string, text: string): Promise<string> {
	const id = crypto.randomUUID();
	const keys = captureKeys(w.workspace.id, id);
	const bytes = new TextEncoder().encode(text);
	await w.services.storage.put(
		keys.raw,
		(async function* () {
			yield bytes;
		})()
	);
	await insertCapture(w.services.db, {
		id,
		workspaceId: w.workspace.id,
		fileName: name,
		sizeBytes: bytes.byteLength,
		actorId: w.users.owner.id,
		rawKey: keys.raw,
		detected: { layout: CANONICAL_LAYOUT, notes: [], problem: null, sampleRows: [] },
		layout: null
	});
	return id;
}

describe('a long export', () => {
	it('lets a request made while it streams be answered before it ends', async () => {
		const w = await buildWorld();
		const { decode: d } = await decode(w);
		const response = (await exportRoute(
			event(w, w.users.viewer, '/w/[ws]/captures/[id]/export', {
				query: `?kind=wide&decode=${d.id}&interval=0.001&mode=mean`
			})
		)) as Response;
		expect(response.status).toBe(200);
		const reader = response.body!.getReader();
		let answeredAt = -1;
		let chunks = 0;
		// A request queued as a macrotask: a stream fed synchronously would starve it until the end.
		setTimeout(async () => {
			const status = await statusRoute(event(w, w.users.viewer, `${API}/status`));
			expect(status.status).toBe(200);
			answeredAt = chunks;
		}, 0);
		for (;;) {
			const { done } = await reader.read();
			if (done) break;
			chunks++;
		}
		expect(chunks).toBeGreaterThan(20);
		expect(answeredAt).toBeGreaterThanOrEqual(0);
		expect(answeredAt).toBeLessThan(chunks);
	});

	it('stops the worker when the download is cancelled', async () => {
		const w = await buildWorld();
		const response = (await exportRoute(
			event(w, w.users.viewer, '/w/[ws]/captures/[id]/export', { query: '?kind=frames' })
		)) as Response;
		const reader = response.body!.getReader();
		expect((await reader.read()).done).toBe(false);
		await reader.cancel();
		// The pool is free again: a decode runs to the end.
		expect((await decode(w)).summary.frameCount).toBeGreaterThan(0);
	});
});

describe('a capture stored by an earlier version (one FrameStore blob)', () => {
	it('is converted to the chunked store the first time it is opened', async () => {
		const w = await buildWorld();
		const id = await uploadRaw(w, 'old.csv', sessionCsv);
		const keys = captureKeys(w.workspace.id, id);
		const { store, ...report } = await ingestCapture(sessionCsv);
		await w.services.storage.put(
			keys.legacyStore,
			(async function* () {
				yield store.toBytes();
			})()
		);
		await w.services.db
			.updateTable('captures')
			.set({ status: 'ready', store_key: keys.legacyStore, frame_count: report.frameCount })
			.where('id', '=', id)
			.execute();
		const page = await framesRoute(
			event(w, w.users.viewer, `${API}/frames`, { params: { id }, query: '?offset=5&limit=3' })
		);
		const body = (await page.json()) as FramesResponse;
		expect(body.total).toBe(store.count);
		expect(body.frames.map((f) => [f.index, f.time, f.id])).toEqual(
			[5, 6, 7].map((i) => [i, store.time[i], store.id[i]])
		);
		const row = await w.services.db
			.selectFrom('captures')
			.select('store_key')
			.where('id', '=', id)
			.executeTakeFirstOrThrow();
		expect(row.store_key).toBe(keys.index);
		expect(await w.services.storage.exists(keys.legacyStore)).toBe(false);
	});
});
