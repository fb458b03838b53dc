// Decode, view and export routes of a capture run as the server runs them: a freshly migrated
// in-memory database, temporary blob storage, the demo fixtures (invented data) and hand-built
// request events. Reference values come from the fixture CSV text itself, read with DataView
// (ECMAScript DataView, big-/little-endian reads), never from the code under test.
import { rmSync } from 'node:fs';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, describe, expect, it } from 'vitest';
import { LONG_FORM_HEADER } from '$lib/can/capture/export';
import { decodeFrame } from '$lib/can/codec';
import type { CanMap } from '$lib/can/map';
import { importCaptureInProcess } from '$lib/server/captures/processing';
import { saveDraft } from '$lib/server/maps/drafts';
import { findMapForWorkspace } from '$lib/server/maps/maps';
import type { SessionUser } from '$lib/server/guard';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	makeEvent,
	outcome,
	type TestServices
} from '$lib/server/test-support';
import { POST as decodeRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as decodesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/decodes/[decodeId]/+server';
import { POST as defineFrameRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/define-frame/+server';
import { GET as framesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/frames/+server';
import { GET as frameRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/frames/[index]/+server';
import { GET as seriesRoute } from '../../../routes/api/workspaces/[ws]/captures/[id]/series/+server';
import { GET as exportRoute } from '../../../routes/w/[ws]/captures/[id]/export/+server';
import type { DecodeResponse, FrameDetail, FrameRow, SeriesResponse } from '$lib/api/capture-views';
import { decodedChannelSamples, forgetCaptureDecodes } from './decoding';

const clubRacer = fixtureMap('club-racer-ecu.map.json');
const sessionCsv = fixtureText('club-racer-session.csv');

/** The fixture's frames as written: line number, time, id, payload bytes. */
const csvFrames = sessionCsv
	.trim()
	.split('\n')
	.slice(1)
	.map((line, k) => {
		const [time, id, extended, , data] = line.split(',');
		return {
			line: k + 2,
			time: Number(time),
			id: Number.parseInt(id, 16),
			extended: extended === '1',
			dataHex: data,
			bytes: Uint8Array.from(data.split(' '), (b) => Number.parseInt(b, 16))
		};
	});
const t0 = csvFrames[0].time;

const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

interface World {
	services: TestServices;
	slug: string;
	workspaceId: string;
	mapId: string;
	captureId: string;
	owner: SessionUser;
	editor: SessionUser;
	viewer: SessionUser;
	outsider: SessionUser;
}

/** r1 = the fixture map; r2 = EngineSpeed at twice the scale (a firmware change, invented). */
function revisionTwo(map: CanMap): CanMap {
	const next = structuredClone(map);
	next.frames[0].signals[0].scale = 2;
	return next;
}

async function buildWorld(): Promise<World> {
	const services = await createTestServices();
	worlds.push(services);
	const { db } = services;
	const {
		workspace: ws,
		users: { owner, editor, viewer, outsider }
	} = await createTeam(db, 'Decode team');
	const mapId = await createPublishedMap(db, {
		workspaceId: ws.id,
		actorId: owner.id,
		revisions: [clubRacer, revisionTwo(clubRacer)]
	});

	// Uploaded by the viewer and processed as the demo seed does it (in this thread, detected layout).
	const captureId = await importCaptureInProcess(services, {
		workspaceId: ws.id,
		actorId: viewer.id,
		fileName: 'club-racer-session.csv',
		text: sessionCsv
	});
	return {
		services,
		slug: ws.slug,
		workspaceId: ws.id,
		mapId,
		captureId,
		owner,
		editor,
		viewer,
		outsider
	};
}

const API = '/api/workspaces/[ws]/captures/[id]';

function event(
	w: World,
	user: SessionUser | null,
	route: string,
	init: { query?: string; body?: unknown; params?: Record<string, string> } = {}
) {
	const routeId = route.startsWith('/w/') ? route : `${API}${route}`;
	const params = { ws: w.slug, id: w.captureId, ...init.params };
	const path =
		routeId.replace(
			/\[(\w+)\]/g,
			(_, name: string) => params[name as keyof typeof params] ?? name
		) + (init.query ?? '');
	return makeEvent<RequestEvent>({
		services: w.services,
		user,
		routeId,
		params,
		path,
		body: init.body
	}) as never;
}

async function decode(
	w: World,
	user: SessionUser,
	revision: number | 'draft'
): Promise<DecodeResponse> {
	const response = await decodeRoute(
		event(w, user, '/decode', { body: { mapId: w.mapId, revision } })
	);
	expect(response.status).toBe(200);
	return response.json();
}

async function jsonOf<T>(response: Response, status = 200): Promise<T> {
	expect(response.status).toBe(status);
	return response.json() as Promise<T>;
}

describe('decoding a capture with a chosen revision', () => {
	it('records the revision, and r1 and r2 differ exactly where the revisions differ', async () => {
		const w = await buildWorld();
		const r1 = await decode(w, w.viewer, 1);
		const r2 = await decode(w, w.viewer, 2);
		expect(r1.decode).toMatchObject({
			mapId: w.mapId,
			mapName: clubRacer.name,
			revision: 1,
			draftVersion: null,
			decodedBy: { email: 'viewer@example.test' }
		});
		expect(r2.decode.revision).toBe(2);
		expect(r1.summary.frameCount).toBe(csvFrames.length);

		// EngineSpeed: start bit 8, big-endian, 16 bits = bytes 0–1 (docs/bit-numbering.md: a big-endian field filling
		// bytes k … k+m−1 has startBit 8·(k+m−1)), read with DataView.
		const speeds = csvFrames
			.filter((f) => f.id === 0x5f0)
			.map((f) => new DataView(f.bytes.buffer).getUint16(0, false));
		const speed1 = r1.summary.channels.find((c) => c.signalName === 'EngineSpeed')!;
		const speed2 = r2.summary.channels.find((c) => c.signalName === 'EngineSpeed')!;
		expect([speed1.min, speed1.max, speed1.count]).toEqual([
			Math.min(...speeds),
			Math.max(...speeds),
			speeds.length
		]);
		expect([speed2.min, speed2.max]).toEqual([2 * Math.min(...speeds), 2 * Math.max(...speeds)]);
		// Every other channel is identical.
		const others = (s: DecodeResponse['summary']) =>
			s.channels.filter((c) => c.signalName !== 'EngineSpeed');
		expect(others(r2.summary)).toEqual(others(r1.summary));
		expect(r2.summary.ids).toEqual(r1.summary.ids);
	});

	it('records the draft version, reopens a decode from storage, and refuses a draft decode whose draft changed', async () => {
		const w = await buildWorld();
		const map = (await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!;
		const draft = await decode(w, w.viewer, 'draft');
		expect(draft.decode).toMatchObject({ revision: null, draftVersion: map.version });

		forgetCaptureDecodes(w.captureId); // as after a restart: decoded again from the stored frames
		const reopened = await jsonOf<DecodeResponse>(
			await decodesRoute(
				event(w, w.viewer, '/decodes/[decodeId]', { params: { decodeId: draft.decode.id } })
			)
		);
		expect(reopened).toEqual(draft);

		await saveDraft(w.services.db, {
			workspaceId: w.workspaceId,
			mapId: w.mapId,
			version: map.version,
			draft: clubRacer,
			actorId: w.owner.id
		});
		forgetCaptureDecodes(w.captureId);
		const gone = await decodesRoute(
			event(w, w.viewer, '/decodes/[decodeId]', { params: { decodeId: draft.decode.id } })
		);
		expect(gone.status).toBe(410);
		expect((await gone.json()).error).toMatch(/draft .* has changed/);
	});

	it('lists unknown IDs with their bit activity counted from the fixture', async () => {
		const w = await buildWorld();
		const { summary } = await decode(w, w.viewer, 1);
		expect(summary.unknownIds.map((u) => u.id)).toEqual([0x5f8, 0x640]);
		// Brute force: for each bit, how many consecutive 0x640 payloads differ in it.
		const frames = csvFrames.filter((f) => f.id === 0x640);
		const bits = 8 * Math.max(...frames.map((f) => f.bytes.length));
		const expected = new Array(bits).fill(0);
		for (let k = 1; k < frames.length; k++) {
			for (let b = 0; b < bits; b++)
				if (((frames[k].bytes[b >> 3] ^ frames[k - 1].bytes[b >> 3]) >> (b & 7)) & 1) expected[b]++;
		}
		expect(summary.unknownIds[1].bitChanges).toEqual(expected);
	});

	it('answers 400 with paths for bad input, 404 for non-members and unknown decodes', async () => {
		const w = await buildWorld();
		const bad = await jsonOf<{ issues: { path: string }[] }>(
			await decodeRoute(event(w, w.viewer, '/decode', { body: { mapId: 5, revision: 'latest' } })),
			400
		);
		expect(bad.issues.map((i) => i.path).sort()).toEqual(['mapId', 'revision']);
		expect(
			(
				await decodeRoute(
					event(w, w.outsider, '/decode', { body: { mapId: w.mapId, revision: 1 } })
				)
			).status
		).toBe(404);
		expect(
			(await decodeRoute(event(w, w.viewer, '/decode', { body: { mapId: w.mapId, revision: 9 } })))
				.status
		).toBe(404);
		expect(
			(
				await decodesRoute(
					event(w, w.viewer, '/decodes/[decodeId]', { params: { decodeId: 'nope' } })
				)
			).status
		).toBe(404);
		const { decode: d } = await decode(w, w.viewer, 1);
		expect(
			(
				await decodesRoute(
					event(w, w.outsider, '/decodes/[decodeId]', { params: { decodeId: d.id } })
				)
			).status
		).toBe(404);
		expect((await framesRoute(event(w, w.outsider, '/frames'))).status).toBe(404);
		expect(
			(await decodeRoute(event(w, null, '/decode', { body: { mapId: w.mapId, revision: 1 } })))
				.status
		).toBe(401);
	});
});

describe('series', () => {
	it('keeps every bucket’s true min and max in at most 2 × points values (brute-force scan)', async () => {
		const w = await buildWorld();
		const { decode: d, summary } = await decode(w, w.viewer, 1);
		const index = summary.channels.find((c) => c.signalName === 'EngineSpeed')!.index;
		const points = 50;
		const from = 0;
		const to = summary.durationS;
		const series = await jsonOf<SeriesResponse>(
			await seriesRoute(
				event(w, w.viewer, '/series', {
					query: `?decode=${d.id}&channel=${index}&points=${points}`
				})
			)
		);
		expect(series.decimated).toBe(true);
		expect(series.time.length).toBeLessThanOrEqual(2 * points);

		// The channel's samples straight from the CSV: time from the first frame, DataView big-endian u16.
		const samples = csvFrames
			.filter((f) => f.id === 0x5f0)
			.map((f) => ({ t: f.time - t0, v: new DataView(f.bytes.buffer).getUint16(0, false) }));
		const channel = await decodedChannelSamples(
			w.services,
			w.workspaceId,
			w.captureId,
			d.id,
			index
		);
		samples.forEach((s, k) => expect(channel.time[k]).toBeCloseTo(s.t, 9));
		expect(Array.from(channel.value)).toEqual(samples.map((s) => s.v));
		// Brute force over the channel's own times: per bucket [from + k·w, from + (k+1)·w), the extremes.
		const width = (to - from) / points;
		const buckets = new Map<number, number[]>();
		channel.time.forEach((t, k) => {
			const b = Math.min(points - 1, Math.floor((t - from) / width));
			buckets.set(b, [...(buckets.get(b) ?? []), channel.value[k]]);
		});
		const returned = new Map<number, number[]>();
		series.time.forEach((t, k) => {
			const b = Math.min(points - 1, Math.floor((t - from) / width));
			returned.set(b, [...(returned.get(b) ?? []), series.value[k]!]);
		});
		expect([...returned.keys()].sort((a, b) => a - b)).toEqual(
			[...buckets.keys()].sort((a, b) => a - b)
		);
		for (const [b, values] of buckets) {
			expect(Math.min(...returned.get(b)!)).toBe(Math.min(...values));
			expect(Math.max(...returned.get(b)!)).toBe(Math.max(...values));
		}
	});

	it('returns every sample of a narrow range undecimated, and refuses bad parameters with paths', async () => {
		const w = await buildWorld();
		const { decode: d } = await decode(w, w.viewer, 1);
		const narrow = await jsonOf<SeriesResponse>(
			await seriesRoute(
				event(w, w.viewer, '/series', {
					query: `?decode=${d.id}&channel=0&from=1&to=1.05&points=2000`
				})
			)
		);
		expect(narrow.decimated).toBe(false);
		const inside = csvFrames.filter(
			(f) => f.id === 0x5f0 && f.time - t0 >= 1 && f.time - t0 <= 1.05
		);
		// Plus one neighbour each side so the line reaches the plot's edges.
		expect(narrow.time.length).toBe(inside.length + 2);
		const cases: [string, string][] = [
			['', 'decode'],
			[`?decode=${d.id}&channel=x`, 'channel'],
			[`?decode=${d.id}&channel=0&points=10001`, 'points'],
			[`?decode=${d.id}&channel=0&from=2&to=1`, 'to'],
			[`?decode=${d.id}&channel=0&from=abc`, 'from']
		];
		for (const [query, path] of cases) {
			const body = await jsonOf<{ issues: { path: string }[] }>(
				await seriesRoute(event(w, w.viewer, '/series', { query })),
				400
			);
			expect(body.issues.map((i) => i.path)).toContain(path);
		}
		expect(
			(await seriesRoute(event(w, w.viewer, '/series', { query: `?decode=${d.id}&channel=999` })))
				.status
		).toBe(404);
	});
});

describe('frames', () => {
	it('pages through frames in capture order and filters by ID', async () => {
		const w = await buildWorld();
		const page = await jsonOf<{ total: number; frames: FrameRow[] }>(
			await framesRoute(event(w, w.viewer, '/frames', { query: '?offset=100&limit=50' }))
		);
		expect(page.total).toBe(csvFrames.length);
		expect(page.frames.map((f) => f.index)).toEqual(Array.from({ length: 50 }, (_, k) => 100 + k));
		expect(page.frames.map((f) => [f.id, f.dataHex])).toEqual(
			csvFrames.slice(100, 150).map((f) => [f.id, f.dataHex])
		);

		const only = await jsonOf<{ total: number; frames: FrameRow[] }>(
			await framesRoute(event(w, w.viewer, '/frames', { query: '?id=0x5f8&offset=10&limit=5' }))
		);
		const all5f8 = csvFrames.filter((f) => f.id === 0x5f8);
		expect(only.total).toBe(all5f8.length);
		expect(only.frames.map((f) => f.dataHex)).toEqual(all5f8.slice(10, 15).map((f) => f.dataHex));
		expect(only.frames.map((f) => f.index)).toEqual(all5f8.slice(10, 15).map((f) => f.line - 2));

		for (const [query, path] of [
			['?limit=1001', 'limit'],
			['?offset=-1', 'offset'],
			['?id=xyz', 'id']
		]) {
			const body = await jsonOf<{ issues: { path: string }[] }>(
				await framesRoute(event(w, w.viewer, '/frames', { query })),
				400
			);
			expect(body.issues.map((i) => i.path)).toContain(path);
		}
	});

	it("decodes one frame's signals as the core codec and DataView read them", async () => {
		const w = await buildWorld();
		const { decode: d } = await decode(w, w.viewer, 1);
		const at = csvFrames.filter((f) => f.id === 0x5f0)[20].line - 2;
		const detail = await jsonOf<FrameDetail>(
			await frameRoute(
				event(w, w.viewer, '/frames/[index]', {
					params: { index: String(at) },
					query: `?decode=${d.id}`
				})
			)
		);
		expect(detail.frame).toMatchObject({
			index: at,
			id: 0x5f0,
			frameName: 'EngineCore',
			dataHex: csvFrames[at].dataHex
		});
		const reference = decodeFrame(clubRacer.frames[0], csvFrames[at].bytes);
		expect(detail.signals.map((s) => s.value)).toEqual(
			reference.map((r) => (r.present ? r.value : null))
		);
		// ThrottlePosition: start bit 24 big-endian = bytes 2–3 (docs/bit-numbering.md), × 0.1 (the fixture map), read with DataView.
		expect(detail.signals[1].value).toBeCloseTo(
			new DataView(csvFrames[at].bytes.buffer).getUint16(2, false) * 0.1,
			9
		);
		// An unknown ID has no signals; an index past the end is a 404.
		const unknown = csvFrames.findIndex((f) => f.id === 0x640);
		expect(
			(
				await jsonOf<FrameDetail>(
					await frameRoute(
						event(w, w.viewer, '/frames/[index]', {
							params: { index: String(unknown) },
							query: `?decode=${d.id}`
						})
					)
				)
			).signals
		).toEqual([]);
		expect(
			(
				await frameRoute(
					event(w, w.viewer, '/frames/[index]', {
						params: { index: '999999' },
						query: `?decode=${d.id}`
					})
				)
			).status
		).toBe(404);
	});
});

describe('define-frame', () => {
	it('appends the unknown ID to the draft with a version bump and an audit entry; 409 once defined; 403 for viewers', async () => {
		const w = await buildWorld();
		const { decode: d } = await decode(w, w.viewer, 2);
		const before = (await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!;
		const body = { decode: d.id, id: 0x640, extended: false };
		expect((await defineFrameRoute(event(w, w.viewer, '/define-frame', { body }))).status).toBe(
			403
		);

		const defined = await jsonOf<{ mapId: string; version: number; frameIndex: number }>(
			await defineFrameRoute(event(w, w.editor, '/define-frame', { body }))
		);
		expect(defined).toEqual({
			mapId: w.mapId,
			version: before.version + 1,
			frameIndex: before.draft.frames.length
		});
		const after = (await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!;
		const frame = after.draft.frames[defined.frameIndex];
		const seen = csvFrames.filter((f) => f.id === 0x640);
		// Mean period = span / gaps, in ms, rounded.
		const period = Math.round(
			((seen[seen.length - 1].time - seen[0].time) / (seen.length - 1)) * 1000
		);
		expect(frame).toMatchObject({
			name: 'Undocumented_0x640',
			id: 0x640,
			extended: false,
			length: Math.max(...seen.map((f) => f.bytes.length)),
			cycleMs: period,
			signals: []
		});
		const audit = await w.services.db
			.selectFrom('audit_log')
			.selectAll()
			.where('action', '=', 'map.frame.define')
			.execute();
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({ actor_id: w.editor.id, target: w.mapId });

		expect((await defineFrameRoute(event(w, w.editor, '/define-frame', { body }))).status).toBe(
			409
		);
		expect(
			(
				await defineFrameRoute(
					event(w, w.editor, '/define-frame', { body: { ...body, id: 0x5f0 } })
				)
			).status
		).toBe(409);
		expect(
			(
				await defineFrameRoute(
					event(w, w.editor, '/define-frame', { body: { ...body, id: 0x123 } })
				)
			).status
		).toBe(404);
		const bad = await jsonOf<{ issues: { path: string }[] }>(
			await defineFrameRoute(
				event(w, w.editor, '/define-frame', { body: { decode: d.id, id: 0x800, extended: false } })
			),
			400
		);
		expect(bad.issues.map((i) => i.path)).toEqual(['id']);
		expect((await findMapForWorkspace(w.services.db, w.workspaceId, w.mapId))!.version).toBe(
			after.version
		);
	});
});

describe('exports', () => {
	const EXPORT = '/w/[ws]/captures/[id]/export';

	it('names the revision and writes long-form values equal to the channel values', async () => {
		const w = await buildWorld();
		const { decode: d, summary } = await decode(w, w.viewer, 2);
		const response = (await exportRoute(
			event(w, w.viewer, EXPORT, { query: `?kind=long&decode=${d.id}` })
		)) as Response;
		expect(response.status).toBe(200);
		expect(response.headers.get('x-framewright-revision')).toBe('r2');
		expect(response.headers.get('content-disposition')).toBe(
			'attachment; filename="club-racer-session.long.club-racer-engine-controller-r2.csv"'
		);
		const lines = (await response.text()).trimEnd().split('\n');
		expect(lines[0]).toBe(LONG_FORM_HEADER);
		expect(lines.length - 1).toBe(summary.channels.reduce((n, c) => n + c.count, 0));
		// r2 doubles EngineSpeed: its exported values are 2 × the DataView reading of the CSV.
		const speeds = lines
			.filter((l) => l.includes(',EngineCore,EngineSpeed,'))
			.map((l) => Number(l.split(',')[3]));
		expect(speeds).toEqual(
			csvFrames
				.filter((f) => f.id === 0x5f0)
				.map((f) => 2 * new DataView(f.bytes.buffer).getUint16(0, false))
		);
	});

	it('exports the raw frames canonically and wide form on an interval; refuses bad queries', async () => {
		const w = await buildWorld();
		const frames = (await exportRoute(
			event(w, w.viewer, EXPORT, { query: '?kind=frames' })
		)) as Response;
		expect(frames.headers.get('content-disposition')).toBe(
			'attachment; filename="club-racer-session.frames.csv"'
		);
		const rows = (await frames.text()).trimEnd().split('\n');
		expect(rows[0]).toBe('time,id,extended,dlc,data');
		expect(rows.length - 1).toBe(csvFrames.length);

		const { decode: d, summary } = await decode(w, w.viewer, 1);
		const wide = (await exportRoute(
			event(w, w.viewer, EXPORT, { query: `?kind=wide&decode=${d.id}&interval=1&mode=last` })
		)) as Response;
		const wideRows = (await wide.text()).trimEnd().split('\n');
		expect(wideRows[0].split(',')).toHaveLength(summary.channels.length + 1);
		const ticks = wideRows.slice(1).map((r) => Number(r.split(',')[0]));
		ticks.slice(1).forEach((t, k) => expect(t - ticks[k]).toBeCloseTo(1, 9));
		expect(ticks[ticks.length - 1]).toBeLessThanOrEqual(summary.durationS);
		expect(ticks.length).toBeGreaterThanOrEqual(Math.floor(summary.durationS));

		const refused = await outcome(() =>
			exportRoute(event(w, w.viewer, EXPORT, { query: '?kind=long' }))
		);
		expect(refused).toMatchObject({ kind: 'error', status: 400 });
		const tiny = await outcome(() =>
			exportRoute(
				event(w, w.viewer, EXPORT, { query: `?kind=wide&decode=${d.id}&interval=0.0000001` })
			)
		);
		expect(tiny).toMatchObject({ kind: 'error', status: 400 });
		const outsider = await outcome(() =>
			exportRoute(event(w, w.outsider, EXPORT, { query: '?kind=frames' }))
		);
		expect(outsider).toMatchObject({ kind: 'error', status: 404 });
	});
});
