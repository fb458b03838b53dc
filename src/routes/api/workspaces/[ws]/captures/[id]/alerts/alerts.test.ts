// POST …/captures/[id]/alerts run as the server runs it: a freshly migrated in-memory database,
// the test services' temporary blob storage, the demo fixtures (invented data) and hand-built request events. The
// expected events come from the fixture CSV read with ECMAScript DataView (little-endian u16 × 0.1
// for oil pressure) and the ISA-18.2 / IEC 62682 latching rule (from memory), not from the code under test.
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import type { AlertReplay } from '$lib/can/alerts/replay';
import { importCaptureInProcess } from '$lib/server/captures/processing';
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
import { POST as decodeRoute } from '../decode/+server';
import { POST as alertsRoute } from './+server';

const clubRacer = fixtureMap('club-racer-ecu.map.json');
const sessionCsv = fixtureText('club-racer-session.csv');

// Reference: oil pressure straight from the CSV bytes, times from the first frame.
const rows = sessionCsv
	.trim()
	.split('\n')
	.slice(1)
	.map((line) => line.split(','));
const t0 = Number(rows[0][0]);
const oil = rows
	.filter((r) => r[1] === '5F2')
	.map((r) => ({
		t: Number(r[0]) - t0,
		v:
			new DataView(
				Uint8Array.from(r[4].split(' '), (b) => Number.parseInt(b, 16)).buffer
			).getUint16(0, true) * 0.1
	}));

interface World {
	services: TestServices;
	slug: string;
	mapId: string;
	captureId: string;
	viewer: SessionUser;
	outsider: SessionUser;
}

/** r1 = the fixture map with its two demo rules; r2 = the same map without rules. */
async function buildWorld(): Promise<World> {
	const services = await createTestServices(); // with a temporary blob store
	const { db } = services;
	const {
		workspace: ws,
		users: { owner, viewer, outsider }
	} = await createTeam(db, 'Alert team');
	const mapId = await createPublishedMap(db, {
		workspaceId: ws.id,
		actorId: owner.id,
		revisions: [clubRacer, { ...clubRacer, alertRules: [] }]
	});

	// Uploaded by the viewer and processed as the demo seed does it (in this thread, detected layout).
	const captureId = await importCaptureInProcess(services, {
		workspaceId: ws.id,
		actorId: viewer.id,
		fileName: 'club-racer-session.csv',
		text: sessionCsv
	});
	return { services, slug: ws.slug, mapId, captureId, viewer, outsider };
}

function event(w: World, user: SessionUser | null, route: 'decode' | 'alerts', body: unknown) {
	const routeId = `/api/workspaces/[ws]/captures/[id]/${route}`;
	const params = { ws: w.slug, id: w.captureId };
	return makeEvent<RequestEvent>({
		services: w.services,
		user,
		routeId,
		params,
		path: `/api/workspaces/${w.slug}/captures/${w.captureId}/${route}`,
		body
	}) as never;
}

async function decodeId(w: World, revision: number): Promise<string> {
	const response = await decodeRoute(event(w, w.viewer, 'decode', { mapId: w.mapId, revision }));
	expect(response.status).toBe(200);
	return ((await response.json()) as { decode: { id: string } }).decode.id;
}

describe('POST /api/workspaces/[ws]/captures/[id]/alerts', () => {
	it("replays the rules of the decode's revision for a viewer: the oil-pressure dip latches", async () => {
		const w = await buildWorld();
		const response = await alertsRoute(
			event(w, w.viewer, 'alerts', { decode: await decodeId(w, 1) })
		);
		expect(response.status).toBe(200);
		const replay = (await response.json()) as AlertReplay;
		expect(replay.rules.map((r) => r.id)).toEqual(['coolant-hot', 'oil-pressure-low']);
		const dip = oil.find((p) => p.v < 250)!; // below the 250 kPa setpoint; on-delay 0.1 s
		const oilEvent = replay.events.find((e) => e.rule === 'oil-pressure-low')!;
		expect(oilEvent.start).toBeCloseTo(dip.t + 0.1, 9);
		expect(oilEvent).toMatchObject({
			severity: 'critical',
			latched: true,
			end: null,
			acknowledgedAt: null
		});
		expect(oilEvent.peak).toBeCloseTo(Math.min(...oil.map((p) => p.v)), 9);
		expect(replay.summary.map((s) => [s.rule, s.count])).toEqual([
			['coolant-hot', 1],
			['oil-pressure-low', 1]
		]);
	});

	it('replays an acknowledgement: the latched event clears at that time', async () => {
		const w = await buildWorld();
		const id = await decodeId(w, 1);
		const response = await alertsRoute(
			event(w, w.viewer, 'alerts', {
				decode: id,
				acknowledgements: [{ ruleId: 'oil-pressure-low', time: 57.5 }]
			})
		);
		const replay = (await response.json()) as AlertReplay;
		expect(replay.events.find((e) => e.rule === 'oil-pressure-low')).toMatchObject({
			end: 57.5,
			acknowledgedAt: 57.5,
			latched: true
		});
	});

	it('uses the rules of the revision the decode used: r2 has none', async () => {
		const w = await buildWorld();
		const replay = (await (
			await alertsRoute(event(w, w.viewer, 'alerts', { decode: await decodeId(w, 2) }))
		).json()) as AlertReplay;
		expect(replay).toMatchObject({ rules: [], events: [], summary: [] });
	});

	it('refuses bad input with the path to fix, an unknown decode, an outsider and no session', async () => {
		const w = await buildWorld();
		const id = await decodeId(w, 1);
		const bad = await alertsRoute(
			event(w, w.viewer, 'alerts', {
				decode: id,
				acknowledgements: [{ ruleId: 'oil-pressure-low', time: 'later' }]
			})
		);
		expect(bad.status).toBe(400);
		expect(
			((await bad.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)
		).toEqual(['acknowledgements.0.time']);

		const unknownRule = await alertsRoute(
			event(w, w.viewer, 'alerts', { decode: id, acknowledgements: [{ ruleId: 'nope', time: 1 }] })
		);
		expect(unknownRule.status).toBe(400);
		expect(await unknownRule.json()).toMatchObject({
			issues: [{ path: 'acknowledgements.0.ruleId', message: expect.stringContaining('"nope"') }]
		});

		expect((await alertsRoute(event(w, w.viewer, 'alerts', {}))).status).toBe(400);
		expect(
			(await alertsRoute(event(w, w.viewer, 'alerts', { decode: 'no-such-decode' }))).status
		).toBe(404);
		const outsider = await outcomeStatus(() =>
			alertsRoute(event(w, w.outsider, 'alerts', { decode: id }))
		);
		// A non-member learns nothing, not even that the workspace exists: 404, never 403.
		expect(outsider).toBe(404);
		expect(await outcomeStatus(() => alertsRoute(event(w, null, 'alerts', { decode: id })))).toBe(
			401
		);
	});
});

/** The status of a route's answer, or of what it threw (SvelteKit `error()` for guards). */
async function outcomeStatus(run: () => Response | Promise<Response>): Promise<number> {
	try {
		return (await run()).status;
	} catch (thrown) {
		return (thrown as { status: number }).status;
	}
}
