// The capture upload/process/delete API run as the server runs it: real route handlers, a freshly
// migrated in-memory database and a temporary storage folder, the parse in a real worker thread.
// Expected frames are written out by hand below (invented demo data) and each CSV variant of
// docs/capture-csv.md is rendered from them; the check is that every variant reads back to them.
import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { isMainThread, threadId as mainThreadId } from 'node:worker_threads';
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { CANONICAL_LAYOUT, type CaptureLayout } from '$lib/can/capture/layout';
import * as listRoute from '../../../routes/api/workspaces/[ws]/captures/+server';
import * as captureRoute from '../../../routes/api/workspaces/[ws]/captures/[id]/+server';
import * as processRoute from '../../../routes/api/workspaces/[ws]/captures/[id]/process/+server';
import * as statusRoute from '../../../routes/api/workspaces/[ws]/captures/[id]/status/+server';
import { load as listLoad } from '../../../routes/w/[ws]/captures/+page.server';
import { load as captureLoad } from '../../../routes/w/[ws]/captures/[id]/+page.server';
import { createMap } from '../maps/maps';
import { publishRevision } from '../maps/revisions';
import type { SessionUser } from '../guard';
import type { Role } from '../../roles';
import {
	createTeam,
	createTestServices,
	makeEvent,
	outcome,
	type TestServices
} from '../test-support';
import type { CaptureDetail, CaptureSummary } from '$lib/api/captures';
import { findCaptureRow } from './captures-db';
import {
	failInterruptedProcessing,
	INTERRUPTED_MESSAGE,
	INTERRUPTED_REREAD_MESSAGE,
	processInWorker,
	processingDone
} from './processing';
import type { DetectedLayout } from '../../api/captures';
import { captureKeys, loadWholeCapture } from './capture-store';

type Handler = (event: RequestEvent) => Promise<Response>;
type Actor = Role | 'outsider';

interface World {
	services: TestServices;
	slug: string;
	workspaceId: string;
	users: Record<Actor, SessionUser>;
}

async function buildWorld(env: Record<string, string> = {}): Promise<World> {
	const services = await createTestServices(env);
	const { db } = services;
	const { workspace: ws, users } = await createTeam(db, 'Capture test team', {
		owner: 'Owner',
		editor: 'Editor',
		viewer: 'Viewer'
	});
	return { services, slug: ws.slug, workspaceId: ws.id, users };
}

function eventFor(
	w: World,
	routeId: string,
	actor: Actor,
	init: { method?: string; params?: Record<string, string>; query?: string; body?: unknown } = {}
) {
	const params = { ws: w.slug, ...init.params };
	const path =
		routeId.replace(
			/\[(\w+)\]/g,
			(_, name: string) => params[name as keyof typeof params] ?? name
		) + (init.query ?? '');
	return makeEvent<RequestEvent>({
		services: w.services,
		user: w.users[actor],
		routeId,
		params,
		path,
		method: init.method ?? 'GET',
		body: init.body
	});
}

/** POSTs raw bytes as a browser upload would (Content-Length set unless `streamed`). */
async function upload(
	w: World,
	actor: Actor,
	name: string,
	content: string | Uint8Array,
	options: { streamed?: boolean } = {}
) {
	const event = eventFor(w, '/api/workspaces/[ws]/captures', actor, {
		method: 'POST',
		query: `?name=${encodeURIComponent(name)}`
	});
	const bytes = typeof content === 'string' ? new TextEncoder().encode(content) : content;
	const headers = new Headers({ 'content-type': 'text/csv' });
	let body: BodyInit = bytes as Uint8Array<ArrayBuffer>;
	if (options.streamed) {
		// No Content-Length: the limit must be enforced while streaming. Sent in 700-byte pieces.
		body = new ReadableStream<Uint8Array>({
			start(controller) {
				for (let at = 0; at < bytes.length; at += 700)
					controller.enqueue(bytes.slice(at, at + 700));
				controller.close();
			}
		});
	} else headers.set('content-length', String(bytes.byteLength));
	(event as { request: Request }).request = new Request(event.url, {
		method: 'POST',
		body,
		headers,
		duplex: 'half'
	} as RequestInit);
	return (listRoute.POST as unknown as Handler)(event);
}

async function uploaded(w: World, name: string, content: string, actor: Actor = 'viewer') {
	const response = await upload(w, actor, name, content);
	const body = await response.json();
	expect(response.status, JSON.stringify(body)).toBe(201);
	return body as { capture: CaptureSummary; detected: DetectedLayout };
}

async function process(w: World, id: string, layout: CaptureLayout, actor: Actor = 'viewer') {
	const response = await (processRoute.POST as unknown as Handler)(
		eventFor(w, '/api/workspaces/[ws]/captures/[id]/process', actor, {
			method: 'POST',
			params: { id },
			body: { layout }
		})
	);
	await processingDone(id);
	return response;
}

async function detail(w: World, id: string, actor: Actor = 'viewer') {
	const response = await (captureRoute.GET as unknown as Handler)(
		eventFor(w, '/api/workspaces/[ws]/captures/[id]', actor, { params: { id } })
	);
	return { status: response.status, body: (await response.json()) as CaptureDetail };
}

/** Uploads, confirms the detected layout unchanged, processes, and returns the detail. */
async function uploadAndProcess(w: World, name: string, content: string) {
	const { capture, detected } = await uploaded(w, name, content);
	const started = await process(w, capture.id, detected.layout);
	expect(started.status).toBe(202);
	const { body } = await detail(w, capture.id);
	return { ...body, detected };
}

/** Every file under the test store (temporary files included). */
async function storedFiles(w: World): Promise<string[]> {
	const entries = await readdir(w.services.storageRoot, { recursive: true, withFileTypes: true });
	return entries.filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name));
}

// ------------------------------------------------------------------ the expected frames

interface Frame {
	time: number;
	id: number;
	extended: boolean;
	data: number[];
}

// Invented demo frames: a standard, an extended (above 0x7FF, so inferable) and a standard ID.
const FRAMES: Frame[] = [
	{ time: 0, id: 0x123, extended: false, data: [0x11, 0x22, 0x33, 0x44, 0x55, 0x66, 0x77, 0x88] },
	{
		time: 0.01,
		id: 0x18feee00,
		extended: true,
		data: [0x28, 0x00, 0xff, 0x10, 0x00, 0x00, 0x00, 0x01]
	},
	{
		time: 0.0205,
		id: 0x7ff,
		extended: false,
		data: [0xde, 0xad, 0xbe, 0xef, 0x00, 0x01, 0x02, 0x03]
	}
];

const hex = (n: number, width = 2) => n.toString(16).toUpperCase().padStart(width, '0');

interface Variant {
	name: string;
	header: string | null;
	delimiter: string;
	row: (f: Frame) => string[];
}

const bytesSpaced = (f: Frame) => f.data.map((b) => hex(b)).join(' ');
const EPOCH = 1_767_225_600; // 2026-01-01T00:00:00Z in Unix seconds

// The variants docs/capture-csv.md names for the importer.
const VARIANTS: Variant[] = [
	{
		name: 'canonical',
		header: 'time,id,extended,dlc,data',
		delimiter: ',',
		row: (f) => [f.time.toFixed(6), hex(f.id, 3), f.extended ? '1' : '0', '8', bytesSpaced(f)]
	},
	{
		name: 'separate byte columns',
		header: 'time,id,extended,dlc,d0,d1,d2,d3,d4,d5,d6,d7',
		delimiter: ',',
		row: (f) => [
			f.time.toFixed(6),
			hex(f.id, 3),
			f.extended ? '1' : '0',
			'8',
			...f.data.map((b) => hex(b))
		]
	},
	{
		name: 'millisecond times',
		header: 'time_ms,id,extended,dlc,data',
		delimiter: ',',
		row: (f) => [
			(f.time * 1e3).toFixed(3),
			hex(f.id, 3),
			f.extended ? '1' : '0',
			'8',
			bytesSpaced(f)
		]
	},
	{
		name: 'microsecond times',
		header: 'timestamp_us,id,extended,dlc,data',
		delimiter: ',',
		row: (f) => [
			String(Math.round(f.time * 1e6)),
			hex(f.id, 3),
			f.extended ? '1' : '0',
			'8',
			bytesSpaced(f)
		]
	},
	{
		name: 'epoch times',
		header: 'time,id,extended,dlc,data',
		delimiter: ',',
		row: (f) => [
			(EPOCH + f.time).toFixed(6),
			hex(f.id, 3),
			f.extended ? '1' : '0',
			'8',
			bytesSpaced(f)
		]
	},
	{
		name: '0x prefixes, unspaced data',
		header: 'time,id,extended,dlc,data',
		delimiter: ',',
		row: (f) => [
			f.time.toFixed(6),
			`0x${hex(f.id, 3)}`,
			f.extended ? '1' : '0',
			'8',
			f.data.map((b) => hex(b)).join('')
		]
	},
	{
		name: 'missing extended flag',
		header: 'time,id,dlc,data',
		delimiter: ',',
		row: (f) => [f.time.toFixed(6), hex(f.id, 3), '8', bytesSpaced(f)]
	},
	{
		name: 'semicolon delimiter',
		header: 'time;id;extended;dlc;data',
		delimiter: ';',
		row: (f) => [f.time.toFixed(6), hex(f.id, 3), f.extended ? '1' : '0', '8', bytesSpaced(f)]
	},
	{
		name: 'tab delimiter, no header',
		header: null,
		delimiter: '\t',
		row: (f) => [f.time.toFixed(6), hex(f.id, 3), f.extended ? '1' : '0', '8', bytesSpaced(f)]
	}
];

const render = (v: Variant) =>
	[...(v.header ? [v.header] : []), ...FRAMES.map((f) => v.row(f).join(v.delimiter))].join('\n') +
	'\n';

// ------------------------------------------------------------------ tests

describe('capture upload and processing', () => {
	it.each(VARIANTS)('reads the $name variant back to the same frames', async (variant) => {
		const w = await buildWorld();
		const result = await uploadAndProcess(w, `${variant.name}.csv`, render(variant));
		expect(result.capture.status).toBe('ready');
		expect(result.capture.progress).toBe(1);
		expect(result.capture.frameCount).toBe(FRAMES.length);
		expect(result.capture.durationS).toBeCloseTo(0.0205, 6);
		expect(result.report?.badRowCount).toBe(0);
		expect(result.layout).toEqual(result.detected.layout);
		const row = (await findCaptureRow(w.services.db, w.workspaceId, result.capture.id))!;
		const store = await loadWholeCapture(w.services.storage, row.store_key!);
		expect(store.count).toBe(FRAMES.length);
		// Epoch seconds near 1.8e9 carry about 0.24 µs of resolution in a float64 (IEEE 754: ulp = 2^-22).
		const digits = variant.name === 'epoch times' ? 6 : 9;
		FRAMES.forEach((f, i) => {
			expect(store.time[i]).toBeCloseTo(f.time, digits);
			expect(store.id[i]).toBe(f.id);
			expect(store.isExtended(i)).toBe(f.extended);
			expect([...store.payload(i)]).toEqual(f.data);
		});
		if (variant.name === 'epoch times')
			expect(store.origin).toEqual({ timeOrigin: EPOCH, epoch: true });
	});

	it('answers 201 with the detected layout, notes and preview rows, status uploaded', async () => {
		const w = await buildWorld();
		const { capture, detected } = await uploaded(w, 'session.csv', render(VARIANTS[0]));
		expect(capture).toMatchObject({
			name: 'session.csv',
			fileName: 'session.csv',
			status: 'uploaded',
			progress: 0,
			frameCount: null,
			uploadedBy: { email: 'viewer@example.test' },
			lastDecode: null
		});
		expect(capture.sizeBytes).toBe(new TextEncoder().encode(render(VARIANTS[0])).byteLength);
		expect(detected.layout).toEqual(CANONICAL_LAYOUT);
		expect(detected.notes.length).toBeGreaterThan(0);
		expect(detected.sampleRows[0]).toEqual(['time', 'id', 'extended', 'dlc', 'data']);
		expect(detected.sampleRows).toHaveLength(1 + FRAMES.length);
		const status = await (statusRoute.GET as unknown as Handler)(
			eventFor(w, '/api/workspaces/[ws]/captures/[id]/status', 'viewer', {
				params: { id: capture.id }
			})
		);
		expect(await status.json()).toEqual({ status: 'uploaded', progress: 0, error: null });
	});

	it('lists a truncated last row as bad by its line and keeps the others', async () => {
		const w = await buildWorld();
		const text = render(VARIANTS[0]).trimEnd();
		const cut = text.slice(0, text.length - 7); // the last row ends mid-way through its data
		const result = await uploadAndProcess(w, 'cut.csv', cut);
		expect(result.capture.status).toBe('ready');
		expect(result.capture.frameCount).toBe(FRAMES.length - 1);
		expect(result.report?.badRowCount).toBe(1);
		expect(result.report?.badRows[0].line).toBe(4); // header is line 1
	});

	it('lists rows with bad hex by line number; good rows survive', async () => {
		const w = await buildWorld();
		const lines = render(VARIANTS[0]).trimEnd().split('\n');
		lines.splice(
			2,
			0,
			'0.005000,1G3,0,8,11 22 33 44 55 66 77 88',
			'0.006000,124,0,8,11 22 ZZ 44 55 66 77 88'
		);
		const result = await uploadAndProcess(w, 'bad-hex.csv', lines.join('\n') + '\n');
		expect(result.capture.frameCount).toBe(FRAMES.length);
		expect(result.report?.badRows.map((b) => b.line)).toEqual([3, 4]);
		expect(result.report?.badRows[1].reason).toMatch(/hex/);
		expect(result.report?.warnings.join(' ')).toMatch(/2 row\(s\) could not be read/);
	});

	it('processes a header-only file to zero frames with a clear warning, not a crash', async () => {
		const w = await buildWorld();
		const result = await uploadAndProcess(w, 'header.csv', 'time,id,extended,dlc,data\n');
		expect(result.capture.status).toBe('ready');
		expect(result.capture.frameCount).toBe(0);
		expect(result.report?.warnings).toContain('The capture has no frames (header only or empty).');
	});

	it('refuses a binary file with 415 and stores nothing', async () => {
		const w = await buildWorld();
		const binary = Uint8Array.from({ length: 20_000 }, (_, i) => (i * 7919) & 0xff);
		const response = await upload(w, 'viewer', 'logger.bin', binary);
		expect(response.status).toBe(415);
		expect((await response.json()).error).toMatch(/binary data.*Nothing was stored/);
		expect(await storedFiles(w)).toEqual([]);
		expect(await w.services.db.selectFrom('captures').selectAll().execute()).toEqual([]);
	});

	it('keeps text whose columns it cannot guess for mapping by hand; refuses an empty file (400)', async () => {
		const w = await buildWorld();
		const prose = await upload(w, 'viewer', 'notes.txt', 'Dear team,\nthe car ran well today.\n');
		expect(prose.status).toBe(201);
		const kept = await prose.json();
		expect(kept.capture.status).toBe('uploaded');
		expect(kept.detected.problem).toMatch(/Could not recognise the capture's columns/);
		expect(kept.detected.sampleRows[1]).toEqual(['the car ran well today.']);
		expect(await storedFiles(w)).toHaveLength(1);
		for (const blank of ['', '\n\n  \n']) {
			const empty = await upload(w, 'viewer', 'empty.csv', blank);
			expect(empty.status).toBe(400);
			expect((await empty.json()).error).toMatch(/empty/);
		}
		expect(await storedFiles(w)).toHaveLength(1);
	});

	it('refuses a file over the size limit with 413, up front and while streaming, storing nothing', async () => {
		const w = await buildWorld({ CAPTURE_MAX_BYTES: '1000' });
		const big = render(VARIANTS[0]).repeat(20);
		expect(big.length).toBeGreaterThan(1000);
		for (const streamed of [false, true]) {
			const response = await upload(w, 'viewer', 'big.csv', big, { streamed });
			expect(response.status).toBe(413);
			expect(await response.json()).toEqual({
				error: 'The file is larger than the upload limit of 1000 bytes; nothing was stored.',
				maxBytes: 1000
			});
		}
		expect(await storedFiles(w)).toEqual([]);
		expect(await w.services.db.selectFrom('captures').selectAll().execute()).toEqual([]);
		// At the limit is fine.
		const small = render(VARIANTS[0]);
		expect((await upload(w, 'viewer', 'small.csv', small, { streamed: true })).status).toBe(201);
	});

	it('refuses a missing file name and a bad layout with the field named', async () => {
		const w = await buildWorld();
		const event = eventFor(w, '/api/workspaces/[ws]/captures', 'viewer', {
			method: 'POST',
			body: 'time,id\n'
		});
		const noName = await (listRoute.POST as unknown as Handler)(event);
		expect(noName.status).toBe(400);
		expect((await noName.json()).issues[0]).toEqual({
			path: 'name',
			message: 'give the file name as ?name='
		});
		const { capture } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		const bad = await process(w, capture.id, { ...CANONICAL_LAYOUT, dataColumn: null });
		expect(bad.status).toBe(400);
		expect((await bad.json()).issues[0].path).toBe('layout.dataColumn');
		expect((await detail(w, capture.id)).body.capture.status).toBe('uploaded');
	});

	it('reports a confirmed layout that reads no row; the capture can then be read again', async () => {
		const w = await buildWorld();
		const { capture } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		// Columns that do not exist in the file: every row is bad, the capture is ready with zero frames
		// and the report says why — the file is never half-processed.
		const result = await process(w, capture.id, { ...CANONICAL_LAYOUT, dataColumn: 9 });
		expect(result.status).toBe(202);
		const { body } = await detail(w, capture.id);
		expect(body.capture.frameCount).toBe(0);
		expect(body.report?.badRowCount).toBe(FRAMES.length);
		expect(body.report?.warnings[0]).toBe('No row could be read as a frame.');
		// Read again with the right layout, without uploading again.
		const again = await process(w, capture.id, CANONICAL_LAYOUT);
		expect(again.status).toBe(202);
		expect((await detail(w, capture.id)).body.capture.frameCount).toBe(FRAMES.length);
	});

	it('marks a capture failed with a readable error when its file cannot be read, and allows a retry', async () => {
		const w = await buildWorld();
		const { capture } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		const row = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		const raw = await w.services.storage.getBytes(row.raw_key);
		await w.services.storage.delete(row.raw_key);
		expect((await process(w, capture.id, CANONICAL_LAYOUT)).status).toBe(202);
		const failed = (await detail(w, capture.id)).body.capture;
		expect(failed.status).toBe('failed');
		expect(failed.error).toMatch(
			/^Processing failed: nothing is stored under ".*raw\.csv"\. The uploaded file is kept; try again/
		);
		expect(await storedFiles(w)).toEqual([]); // no half-written frame store
		async function* again() {
			yield raw;
		}
		await w.services.storage.put(row.raw_key, again());
		expect((await process(w, capture.id, CANONICAL_LAYOUT)).status).toBe(202);
		expect((await detail(w, capture.id)).body.capture).toMatchObject({
			status: 'ready',
			frameCount: FRAMES.length,
			error: null
		});
	});

	it('marks a capture cut off by a server restart as failed, so it can be processed again', async () => {
		const w = await buildWorld();
		const { capture } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		await w.services.db
			.updateTable('captures')
			.set({ status: 'processing', progress: 0.4 })
			.where('id', '=', capture.id)
			.execute();
		expect(await failInterruptedProcessing(w.services.db)).toBe(1);
		expect((await detail(w, capture.id)).body.capture).toMatchObject({
			status: 'failed',
			progress: 0,
			error: INTERRUPTED_MESSAGE
		});
		expect((await process(w, capture.id, CANONICAL_LAYOUT)).status).toBe(202);
		expect((await detail(w, capture.id)).body.capture.status).toBe('ready');
	});

	it('parses in a worker thread, not the main thread', async () => {
		expect(isMainThread).toBe(true);
		const { storage } = await createTestServices();
		const keys = captureKeys('w', 'c');
		await storage.put(keys.raw, single(new TextEncoder().encode(render(VARIANTS[0]))));
		const outcome = await processInWorker(storage, {
			rawKey: keys.raw,
			layout: CANONICAL_LAYOUT,
			storeFolder: keys.storeFolder
		});
		expect(outcome.threadId).toBeGreaterThan(0);
		expect(outcome.threadId).not.toBe(mainThreadId);
		expect(outcome.ok && outcome.frameCount).toBe(FRAMES.length);
	});

	it('reports progress as the worker reads the file, ending at the full size; memory is one segment', async () => {
		const text = render(VARIANTS[0]);
		const bytes = new TextEncoder().encode(
			text +
				Array.from(
					{ length: 200_000 },
					(_, i) => `${(0.03 + i / 1000).toFixed(6)},321,0,2,AB CD`
				).join('\n') +
				'\n'
		);
		const { storage } = await createTestServices();
		const keys = captureKeys('w', 'c');
		await storage.put(keys.raw, single(bytes));
		const seen: number[] = [];
		const outcome = await processInWorker(
			storage,
			{
				rawKey: keys.raw,
				layout: CANONICAL_LAYOUT,
				storeFolder: keys.storeFolder,
				segmentFrames: 50_000
			},
			(n) => seen.push(n)
		);
		expect(outcome.ok && outcome.frameCount).toBe(FRAMES.length + 200_000);
		expect(seen.length).toBeGreaterThan(10);
		expect(seen.every((n, i) => i === 0 || n > seen[i - 1])).toBe(true);
		expect(seen.at(-1)).toBe(bytes.length);
		// Five segments of at most 50,000 frames and the index, written while parsing.
		expect(await storage.list(keys.storeFolder)).toEqual([
			`${keys.storeFolder}index.fwci`,
			...[0, 1, 2, 3, 4].map((s) => `${keys.storeFolder}segment-00000${s}.fwcg`)
		]);
	});
});

async function* single(bytes: Uint8Array) {
	yield bytes;
}

describe('capture roles', () => {
	it('lets viewers upload and list; a non-member gets 404 everywhere', async () => {
		const w = await buildWorld();
		const { capture } = await uploaded(w, 'mine.csv', render(VARIANTS[0]), 'viewer');
		const list = await (listRoute.GET as unknown as Handler)(
			eventFor(w, '/api/workspaces/[ws]/captures', 'viewer')
		);
		expect(
			((await list.json()) as { captures: CaptureSummary[] }).captures.map((c) => c.id)
		).toEqual([capture.id]);
		expect((await upload(w, 'outsider', 'x.csv', render(VARIANTS[0]))).status).toBe(404);
		expect(
			(
				await (listRoute.GET as unknown as Handler)(
					eventFor(w, '/api/workspaces/[ws]/captures', 'outsider')
				)
			).status
		).toBe(404);
		expect((await detail(w, capture.id, 'outsider')).status).toBe(404);
		expect((await process(w, capture.id, CANONICAL_LAYOUT, 'outsider')).status).toBe(404);
	});

	it('deletes: the uploader their own, the owner any, others 403; blobs go too', async () => {
		const w = await buildWorld();
		const del = (id: string, actor: Actor) =>
			(captureRoute.DELETE as unknown as Handler)(
				eventFor(w, '/api/workspaces/[ws]/captures/[id]', actor, {
					method: 'DELETE',
					params: { id }
				})
			);
		const a = (await uploadAndProcess(w, 'a.csv', render(VARIANTS[0]))).capture; // by the viewer
		const b = (await uploaded(w, 'b.csv', render(VARIANTS[0]), 'editor')).capture;
		expect((await storedFiles(w)).length).toBe(4); // a: raw + chunk index + one segment, b: raw

		const refused = await del(b.id, 'viewer');
		expect(refused.status).toBe(403);
		expect((await refused.json()).error).toBe(
			'Only a workspace owner or the person who uploaded this capture can delete it.'
		);
		expect((await del(a.id, 'editor')).status).toBe(403);
		expect((await del(a.id, 'outsider')).status).toBe(404);

		expect((await del(a.id, 'viewer')).status).toBe(204);
		expect((await storedFiles(w)).length).toBe(1);
		expect((await del(b.id, 'owner')).status).toBe(204);
		expect(await storedFiles(w)).toEqual([]);
		expect((await detail(w, a.id)).status).toBe(404);
	});
});

describe('capture page loads', () => {
	it('list and detail loads return the API shapes plus maps with revision numbers', async () => {
		const w = await buildWorld();
		const map = await createMap(w.services.db, {
			workspaceId: w.workspaceId,
			map: {
				format: 'framewright-map@1',
				name: 'Test map',
				bitrate: 500_000,
				frames: [],
				alertRules: []
			},
			actorId: w.users.editor.id,
			source: 'blank'
		});
		await publishRevision(w.services.db, {
			workspaceId: w.workspaceId,
			mapId: map.id,
			version: 1,
			actorId: w.users.editor.id,
			note: 'first'
		});
		const result = await uploadAndProcess(w, 'a.csv', render(VARIANTS[0]));
		const list = (await listLoad(eventFor(w, '/w/[ws]/captures', 'viewer') as never)) as {
			captures: CaptureSummary[];
		};
		expect(list.captures).toEqual([result.capture]);
		const page = (await captureLoad(
			eventFor(w, '/w/[ws]/captures/[id]', 'viewer', { params: { id: result.capture.id } }) as never
		)) as CaptureDetail & { maps: unknown };
		expect(page.capture).toEqual(result.capture);
		expect(page.report).toEqual(result.report);
		expect(page.maps).toEqual([{ id: map.id, name: 'Test map', revisions: [1] }]);
		const missing = await outcome(() =>
			captureLoad(
				eventFor(w, '/w/[ws]/captures/[id]', 'viewer', { params: { id: 'nope' } }) as never
			)
		);
		expect(missing).toEqual({ kind: 'error', status: 404, message: 'Capture not found.' });
	});
});

describe('compressed uploads and reading a file again', () => {
	// gzip files made by Node's zlib (RFC 1952); the check is that the frames read back are FRAMES.
	const gz = (text: string) => new Uint8Array(gzipSync(new TextEncoder().encode(text)));

	it('reads a gzip upload (told by its magic bytes, whatever its name), storing it compressed', async () => {
		const w = await buildWorld();
		for (const [name, streamed] of [
			['session.csv.gz', false],
			['no-suffix.csv', true]
		] as const) {
			const bytes = gz(render(VARIANTS[1]));
			const response = await upload(w, 'viewer', name, bytes, { streamed });
			const body = (await response.json()) as { capture: CaptureSummary; detected: DetectedLayout };
			expect(response.status, JSON.stringify(body)).toBe(201);
			expect(body.detected.sampleRows[0][0]).toBe('time');
			expect(body.capture.sizeBytes).toBe(bytes.byteLength);
			const row = (await findCaptureRow(w.services.db, w.workspaceId, body.capture.id))!;
			expect(row.raw_key.endsWith('raw.csv.gz')).toBe(true);
			const stored = await w.services.storage.getBytes(row.raw_key);
			expect([stored[0], stored[1]]).toEqual([0x1f, 0x8b]); // RFC 1952, 2.3.1: ID1 ID2
			expect((await process(w, body.capture.id, body.detected.layout)).status).toBe(202);
			const processed = (await findCaptureRow(w.services.db, w.workspaceId, body.capture.id))!;
			const store = await loadWholeCapture(w.services.storage, processed.store_key!);
			expect(store.count).toBe(FRAMES.length);
			FRAMES.forEach((f, i) => expect([...store.payload(i)]).toEqual(f.data));
		}
	});

	it('refuses a decompression bomb with 413 and stores nothing', async () => {
		const w = await buildWorld({ CAPTURE_MAX_BYTES: '4000' });
		const text = render(VARIANTS[0]).repeat(2000); // about 300 kB of text
		const bytes = gz(text);
		expect(bytes.byteLength).toBeLessThan(4000);
		expect(text.length).toBeGreaterThan(4000);
		for (const streamed of [false, true]) {
			const response = await upload(w, 'viewer', 'bomb.csv.gz', bytes, { streamed });
			expect(response.status).toBe(413);
			expect(await response.json()).toEqual({
				error:
					'The compressed file decompresses to more than the upload limit of 3.91 KiB; nothing was stored.',
				maxBytes: 4000
			});
		}
		expect(await storedFiles(w)).toEqual([]);
		expect(await w.services.db.selectFrom('captures').selectAll().execute()).toEqual([]);
	});

	it('refuses a damaged or cut-short gzip file with a clear message, storing nothing', async () => {
		const w = await buildWorld();
		const whole = gz(
			Array.from(
				{ length: 3000 },
				(_, i) => `${(i / 1000).toFixed(6)},${hex(i % 2048, 3)},0,2,${hex(i % 256)} 00`
			).join('\n')
		);
		const cut = whole.slice(0, whole.byteLength >> 1);
		const damaged = whole.slice();
		damaged.fill(0xff, 20, 40); // deflate blocks overwritten
		const truncatedAnswer = await upload(w, 'viewer', 'cut.csv.gz', cut);
		expect(truncatedAnswer.status).toBe(400);
		expect((await truncatedAnswer.json()).error).toBe(
			'The gzip-compressed file ends too early (it was cut short, e.g. by an interrupted download); compress or copy it again. Nothing was stored.'
		);
		const damagedAnswer = await upload(w, 'viewer', 'damaged.csv.gz', damaged, { streamed: true });
		expect(damagedAnswer.status).toBe(400);
		expect((await damagedAnswer.json()).error).toMatch(
			/^The gzip-compressed file is damaged \(.+\); compress it again from the original capture\. Nothing was stored\.$/
		);
		expect(await storedFiles(w)).toEqual([]);
		expect(await w.services.db.selectFrom('captures').selectAll().execute()).toEqual([]);
	});

	it('reads a processed capture again with another layout, replacing its store and decodes once done', async () => {
		const w = await buildWorld();
		// Read first with the byte columns in reverse order: every payload reads back reversed.
		const { capture, detected } = await uploaded(w, 'cols.csv', render(VARIANTS[1]));
		const reversed = {
			...detected.layout,
			byteColumns: [...detected.layout.byteColumns].reverse()
		};
		expect((await process(w, capture.id, reversed)).status).toBe(202);
		const first = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		expect(first.store_key).toMatch(/\/store\/index\.fwci$/);
		const firstStore = await loadWholeCapture(w.services.storage, first.store_key!);
		expect([...firstStore.payload(0)]).toEqual([...FRAMES[0].data].reverse());
		const keys = captureKeys(w.workspaceId, capture.id);
		// A decode made from the first store (its stored figures).
		await w.services.storage.put(
			`${keys.decodes}m.r1/summary.json`,
			single(new Uint8Array([123, 125]))
		);

		expect((await process(w, capture.id, detected.layout)).status).toBe(202);
		const { body } = await detail(w, capture.id);
		expect(body.capture).toMatchObject({ status: 'ready', error: null, frameCount: FRAMES.length });
		expect(body.layout).toEqual(detected.layout);
		const row = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		expect(row.store_key).toBe(`${keys.folder}store-2/index.fwci`);
		const store = await loadWholeCapture(w.services.storage, row.store_key!);
		FRAMES.forEach((f, i) => expect([...store.payload(i)]).toEqual(f.data));
		// The earlier store and its decodes are gone; the upload stays.
		const left = await w.services.storage.list(keys.folder);
		expect(
			left.filter((k) => k.startsWith(keys.storeFolder) || k.startsWith(keys.decodes))
		).toEqual([]);
		expect(left).toContain(keys.raw);
		const audit = await w.services.db
			.selectFrom('audit_log')
			.select('action')
			.where('target', '=', capture.id)
			.orderBy('id')
			.execute();
		expect(audit.map((a) => a.action)).toEqual([
			'capture.upload',
			'capture.process',
			'capture.reprocess'
		]);
	});

	it('keeps the earlier result when reading again fails (a layout reading no frame, a lost file)', async () => {
		const w = await buildWorld();
		const { capture, detected } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		expect((await process(w, capture.id, detected.layout)).status).toBe(202);
		const before = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		const filesBefore = await storedFiles(w);

		expect((await process(w, capture.id, { ...detected.layout, dataColumn: 9 })).status).toBe(202);
		let { body } = await detail(w, capture.id);
		expect(body.capture).toMatchObject({ status: 'ready', frameCount: FRAMES.length });
		expect(body.capture.error).toMatch(
			/^Reading the file again failed, so the earlier result is kept: no row could be read as a frame with this layout \(line 2: .+\)\.$/
		);
		expect(body.layout).toEqual(detected.layout);
		const after = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		expect(after.store_key).toBe(before.store_key);
		expect(await storedFiles(w)).toEqual(filesBefore); // no half-written second store

		await w.services.storage.delete(before.raw_key);
		expect((await process(w, capture.id, detected.layout)).status).toBe(202);
		({ body } = await detail(w, capture.id));
		expect(body.capture.status).toBe('ready');
		expect(body.capture.error).toMatch(
			/^Reading the file again failed, so the earlier result is kept: Processing failed: nothing is stored/
		);
		expect((await loadWholeCapture(w.services.storage, before.store_key!)).count).toBe(
			FRAMES.length
		);
	});

	it('answers 409 to reading again a capture being processed; a re-read cut by a restart keeps the earlier result', async () => {
		const w = await buildWorld();
		const { capture, detected } = await uploaded(w, 'a.csv', render(VARIANTS[0]));
		expect((await process(w, capture.id, detected.layout)).status).toBe(202);
		const before = (await findCaptureRow(w.services.db, w.workspaceId, capture.id))!;
		await w.services.db
			.updateTable('captures')
			.set({ status: 'processing', progress: 0.4 })
			.where('id', '=', capture.id)
			.execute();
		const busy = await process(w, capture.id, detected.layout);
		expect(busy.status).toBe(409);
		expect((await busy.json()).error).toBe('This capture is being processed already.');
		const keys = captureKeys(w.workspaceId, capture.id);
		await w.services.storage.put(
			`${keys.folder}store-2/segment-000000.fwcg`,
			single(new Uint8Array(8))
		);
		expect(await failInterruptedProcessing(w.services.db, w.services.storage)).toBe(1);
		expect((await detail(w, capture.id)).body.capture).toMatchObject({
			status: 'ready',
			frameCount: FRAMES.length,
			error: INTERRUPTED_REREAD_MESSAGE
		});
		expect(await w.services.storage.list(`${keys.folder}store-2/`)).toEqual([]);
		expect((await findCaptureRow(w.services.db, w.workspaceId, capture.id))!.store_key).toBe(
			before.store_key
		);
	});
});
