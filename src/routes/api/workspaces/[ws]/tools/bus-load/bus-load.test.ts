// The bus-load route run as the server runs it: a freshly migrated in-memory database, the demo
// fixture map (invented data) published as r1, hand-built request events.
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import type { SessionUser } from '$lib/server/guard';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	makeEvent,
	type TestServices
} from '$lib/server/test-support';
import type { BusLoadResponse } from '$lib/api/tools';
import { GET } from './+server';

const ROUTE = '/api/workspaces/[ws]/tools/bus-load';
const clubRacer = fixtureMap('club-racer-ecu.map.json');

interface World {
	services: TestServices;
	slug: string;
	workspaceId: string;
	mapId: string;
	viewer: SessionUser;
	outsider: SessionUser;
}

async function buildWorld(): Promise<World> {
	const services = await createTestServices();
	const { db } = services;
	const {
		workspace: ws,
		users: { owner, viewer, outsider }
	} = await createTeam(db, 'Bus load team');
	// The draft drops the fastest frame, so r1 and the draft have different loads.
	const mapId = await createPublishedMap(db, {
		workspaceId: ws.id,
		actorId: owner.id,
		revisions: [clubRacer],
		draft: { ...structuredClone(clubRacer), frames: clubRacer.frames.slice(1) }
	});
	return { services, slug: ws.slug, workspaceId: ws.id, mapId, viewer, outsider };
}

async function get(w: World, user: SessionUser | null, query: string): Promise<Response> {
	const path = `/api/workspaces/${w.slug}/tools/bus-load${query}`;
	return GET(
		makeEvent<RequestEvent>({
			services: w.services,
			user,
			routeId: ROUTE,
			params: { ws: w.slug },
			path
		}) as never
	);
}

describe('GET /api/workspaces/[ws]/tools/bus-load', () => {
	it('gives a viewer the load of the loaded revision, worked by hand', async () => {
		const w = await buildWorld();
		const response = await get(w, w.viewer, `?mapId=${w.mapId}&rev=r1`);
		expect(response.status).toBe(200);
		const body = (await response.json()) as BusLoadResponse;
		// The fixture's six frames are all standard 8-byte frames sending 240 frames/s in total.
		// ISO 11898-1: 44 + 8·8 = 108 bits SOF…EOF, + 3 intermission = 111 bits each →
		// 240 × 111 = 26,640 bit/s = 5.328 % of 500 kbit/s. Worst case (Davis et al. 2007):
		// + ⌊(34 + 64 − 1) / 4⌋ = 24 stuff bits → 135 bits → 32,400 bit/s = 6.48 %.
		expect(body.busLoad.bitrate).toBe(500_000);
		expect(body.busLoad.nominalPercent).toBeCloseTo(5.328, 9);
		expect(body.busLoad.worstCasePercent).toBeCloseTo(6.48, 9);
		expect(body.label).toBe('r1');
		expect(body.frames.map((f) => f.cycleMs)).toEqual(clubRacer.frames.map((f) => f.cycleMs));
	});

	it('reads the draft when asked, and applies a bit-rate override', async () => {
		const w = await buildWorld();
		const draft = (await (
			await get(w, w.viewer, `?mapId=${w.mapId}&rev=draft`)
		).json()) as BusLoadResponse;
		const r1 = (await (
			await get(w, w.viewer, `?mapId=${w.mapId}&rev=1`)
		).json()) as BusLoadResponse;
		expect(draft.label).toBe('draft');
		expect(draft.busLoad.frames).toHaveLength(clubRacer.frames.length - 1);
		expect(draft.busLoad.worstCasePercent).toBeLessThan(r1.busLoad.worstCasePercent);
		const at250k = (await (
			await get(w, w.viewer, `?mapId=${w.mapId}&rev=1&bitrate=250000`)
		).json()) as BusLoadResponse;
		// Half the bit rate carries the same bits: twice the share (arithmetic of percent of capacity).
		expect(at250k.busLoad.bitrate).toBe(250_000);
		expect(at250k.busLoad.nominalPercent).toBeCloseTo(10.656, 9);
		expect(at250k.busLoad.worstCasePercent).toBeCloseTo(12.96, 9);
	});

	it.each([
		['', 'mapId'],
		['?mapId=', 'mapId'],
		['?mapId=x&rev=r0', 'rev'],
		['?mapId=x&rev=latest', 'rev'],
		['?mapId=x&bitrate=fast', 'bitrate'],
		['?mapId=x&bitrate=999', 'bitrate'],
		['?mapId=x&bitrate=9000000', 'bitrate']
	])('refuses %s with 400 naming %s', async (query, path) => {
		const w = await buildWorld();
		const response = await get(w, w.viewer, query);
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.issues.map((i) => i.path)).toContain(path);
		expect(body.issues.every((i) => i.message.length > 0)).toBe(true);
	});

	it('answers 404 for a revision or map that does not exist', async () => {
		const w = await buildWorld();
		expect((await get(w, w.viewer, `?mapId=${w.mapId}&rev=7`)).status).toBe(404);
		expect((await get(w, w.viewer, `?mapId=not-a-map&rev=1`)).status).toBe(404);
	});

	it('hides the workspace from a non-member (404) and asks a signed-out visitor to sign in (401)', async () => {
		const w = await buildWorld();
		const outsider = await get(w, w.outsider, `?mapId=${w.mapId}&rev=1`);
		expect(outsider.status).toBe(404);
		expect(await outsider.json()).not.toHaveProperty('busLoad');
		expect((await get(w, null, `?mapId=${w.mapId}&rev=1`)).status).toBe(401);
	});
});
