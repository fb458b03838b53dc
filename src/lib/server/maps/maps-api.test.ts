// The map JSON API run as the server runs it: real route handlers, a freshly migrated in-memory
// database, hand-built request events. Maps come from the demo fixtures (invented data).
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import type { CanMap, CanMapInput } from '$lib/can/map';
import { parseMap } from '$lib/can/map-json';
import type { MapDiff } from '$lib/can/map-diff';
import * as mapsRoute from '../../../routes/api/workspaces/[ws]/maps/+server';
import * as mapRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/+server';
import * as draftRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/draft/+server';
import * as revisionsRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/revisions/+server';
import * as revisionRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/revisions/[n]/+server';
import * as diffRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/diff/+server';
import * as restoreRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/restore/+server';
import * as shareLinksRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/share-links/+server';
import * as shareLinkRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/share-links/[id]/+server';
import * as exportRoute from '../../../routes/w/[ws]/maps/[mapId]/export/+server';
import {
	editJ1939Field,
	setJ1939
} from '../../../routes/w/[ws]/maps/[mapId]/frames/[frameIndex]/j1939-fields';
import { createWorkspace } from '../workspaces/workspaces';
import type { SessionUser } from '../guard';
import type { Role } from '../../roles';
import {
	countRows,
	createTeam,
	createTestServices,
	fixtureText,
	makeEvent,
	type TestServices
} from '../test-support';

type Handler = (event: RequestEvent) => Promise<Response>;
type Actor = Role | 'outsider' | 'signed-out';

const clubRacerJson = fixtureText('club-racer-ecu.map.json');

interface World {
	services: TestServices;
	slug: string;
	users: Record<Role | 'outsider', SessionUser>;
	mapId: string;
}

async function buildWorld(): Promise<World> {
	const services = await createTestServices();
	const { db } = services;
	const { workspace: ws, users } = await createTeam(db, 'Map test team', {
		owner: 'Owner',
		editor: 'Editor'
	});
	const w = { services, slug: ws.slug, users, mapId: '' };
	const created = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
		method: 'POST',
		body: { mapJson: clubRacerJson }
	});
	expect(created.status).toBe(201);
	w.mapId = ((await created.json()) as { map: { id: string } }).map.id;
	return w;
}

interface CallOptions {
	method?: string;
	body?: unknown;
	params?: Record<string, string>;
	query?: string;
}

function call(
	w: Omit<World, 'mapId'> & { mapId: string },
	handler: unknown,
	routeId: string,
	actor: Actor,
	options: CallOptions = {}
) {
	const params = { ws: w.slug, mapId: w.mapId, ...options.params };
	const path =
		routeId.replace(
			/\[(\w+)\]/g,
			(_, name: string) => params[name as keyof typeof params] ?? name
		) + (options.query ?? '');
	const user = actor === 'signed-out' ? null : w.users[actor];
	return (handler as Handler)(
		makeEvent({
			services: w.services,
			user,
			routeId,
			params,
			path,
			method: options.method ?? 'GET',
			body: options.body
		})
	);
}

async function getMap(w: World): Promise<{
	map: { draft: CanMap; version: number; name: string };
	lint: { severity: string }[];
	revisions: { number: number; note: string }[];
	role: Role;
}> {
	const response = await call(w, mapRoute.GET, '/api/workspaces/[ws]/maps/[mapId]', 'viewer');
	expect(response.status).toBe(200);
	return response.json();
}

/** `draft` is sent as JSON, as a browser would send it. */
async function saveDraft(w: World, draft: unknown, version: number, actor: Actor = 'editor') {
	return call(w, draftRoute.PUT, '/api/workspaces/[ws]/maps/[mapId]/draft', actor, {
		method: 'PUT',
		body: { version, draft }
	});
}

async function publish(w: World, note: string, version: number) {
	return call(w, revisionsRoute.POST, '/api/workspaces/[ws]/maps/[mapId]/revisions', 'editor', {
		method: 'POST',
		body: { note, version }
	});
}

const snapshotTables = ['maps', 'map_revisions', 'share_links', 'audit_log'] as const;
const snapshot = (w: World) => Promise.all(snapshotTables.map((t) => countRows(w.services.db, t)));

// ------------------------------------------------------------------ roles and membership

interface RouteCase {
	name: string;
	minimum: Role;
	success: number;
	routeId: string;
	handler: unknown;
	method: string;
	body?: (w: World) => unknown;
	params?: (w: World) => Record<string, string>;
	query?: string;
	/** Prepares what the call needs (a revision, a share link). */
	prepare?: (w: World) => Promise<Record<string, string> | void>;
}

async function withRevision(w: World) {
	expect((await publish(w, 'r1 for the test', 1)).status).toBe(201);
}

const routeCases: RouteCase[] = [
	{
		name: 'list maps',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.GET,
		method: 'GET'
	},
	{
		name: 'create map',
		minimum: 'editor',
		success: 201,
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.POST,
		method: 'POST',
		body: () => ({ name: 'Blank map' })
	},
	{
		name: 'get map',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]',
		handler: mapRoute.GET,
		method: 'GET'
	},
	{
		name: 'rename map',
		minimum: 'editor',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]',
		handler: mapRoute.PATCH,
		method: 'PATCH',
		body: () => ({ name: 'Renamed', version: 1 })
	},
	{
		name: 'delete map',
		minimum: 'owner',
		success: 204,
		routeId: '/api/workspaces/[ws]/maps/[mapId]',
		handler: mapRoute.DELETE,
		method: 'DELETE'
	},
	{
		name: 'save draft',
		minimum: 'editor',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/draft',
		handler: draftRoute.PUT,
		method: 'PUT',
		body: () => ({ version: 1, draft: JSON.parse(clubRacerJson) })
	},
	{
		name: 'publish',
		minimum: 'editor',
		success: 201,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions',
		handler: revisionsRoute.POST,
		method: 'POST',
		body: () => ({ note: 'First', version: 1 })
	},
	{
		name: 'list revisions',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions',
		handler: revisionsRoute.GET,
		method: 'GET'
	},
	{
		name: 'get revision',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions/[n]',
		handler: revisionRoute.GET,
		method: 'GET',
		params: () => ({ n: '1' }),
		prepare: withRevision
	},
	{
		name: 'diff',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/diff',
		handler: diffRoute.GET,
		method: 'GET',
		query: '?from=1&to=draft',
		prepare: withRevision
	},
	{
		name: 'restore',
		minimum: 'editor',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/restore',
		handler: restoreRoute.POST,
		method: 'POST',
		body: () => ({ revision: 1, version: 1 }),
		prepare: withRevision
	},
	{
		name: 'list share links',
		minimum: 'viewer',
		success: 200,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/share-links',
		handler: shareLinksRoute.GET,
		method: 'GET'
	},
	{
		name: 'create share link',
		minimum: 'editor',
		success: 201,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/share-links',
		handler: shareLinksRoute.POST,
		method: 'POST',
		body: () => ({ revision: 1 }),
		prepare: withRevision
	},
	{
		name: 'revoke share link',
		minimum: 'editor',
		success: 204,
		routeId: '/api/workspaces/[ws]/maps/[mapId]/share-links/[id]',
		handler: shareLinkRoute.DELETE,
		method: 'DELETE',
		prepare: async (w) => {
			await withRevision(w);
			const created = await call(
				w,
				shareLinksRoute.POST,
				'/api/workspaces/[ws]/maps/[mapId]/share-links',
				'editor',
				{ method: 'POST', body: { revision: 1 } }
			);
			return { id: ((await created.json()) as { shareLink: { id: string } }).shareLink.id };
		}
	}
];

const rank: Record<Role, number> = { viewer: 1, editor: 2, owner: 3 };
const actors: Actor[] = ['owner', 'editor', 'viewer', 'outsider', 'signed-out'];
const matrix = routeCases.flatMap((c) =>
	actors.map((actor) => ({
		...c,
		actor,
		expected:
			actor === 'signed-out'
				? 401
				: actor === 'outsider'
					? 404
					: rank[actor] >= rank[c.minimum]
						? c.success
						: 403
	}))
);

describe('roles and membership on every map API route', () => {
	it.each(matrix)('$name as $actor → $expected', async (c) => {
		const w = await buildWorld();
		const extra = (await c.prepare?.(w)) ?? {};
		const before = await snapshot(w);
		const mailsBefore = w.services.outbox.length;
		const response = await call(w, c.handler, c.routeId, c.actor, {
			method: c.method,
			body: c.body?.(w),
			params: { ...c.params?.(w), ...extra },
			query: c.query
		});
		expect(response.status).toBe(c.expected);
		if (c.expected >= 400) {
			expect(Object.keys(await response.json())).toEqual(['error']);
			expect(await snapshot(w)).toEqual(before);
			expect(w.services.outbox.length).toBe(mailsBefore);
		} else if (c.method !== 'GET') {
			// Every change leaves exactly one audit entry.
			const auditIndex = snapshotTables.indexOf('audit_log');
			expect((await snapshot(w))[auditIndex]).toBe(before[auditIndex] + 1);
		}
	});

	it('answers 404 for a map of another workspace, even to its owner there', async () => {
		const w = await buildWorld();
		const other = await createWorkspace(w.services.db, {
			name: 'Other team',
			ownerId: w.users.outsider.id
		});
		const response = await call(
			{ ...w, slug: other.slug, users: { ...w.users, owner: w.users.outsider } },
			mapRoute.GET,
			'/api/workspaces/[ws]/maps/[mapId]',
			'owner'
		);
		expect(response.status).toBe(404);
		expect(await response.json()).toEqual({ error: 'Map not found in this workspace.' });
	});
});

// ------------------------------------------------------------------ bad input

const badInput: {
	name: string;
	routeId: string;
	handler: unknown;
	method: string;
	body: unknown;
	paths: string[];
}[] = [
	{
		name: 'create: body not JSON',
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.POST,
		method: 'POST',
		body: '{"name":',
		paths: ['(root)']
	},
	{
		name: 'create: unknown field',
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.POST,
		method: 'POST',
		body: { name: 'A', colour: 'red' },
		paths: ['(root)']
	},
	{
		name: 'create: name of the wrong type',
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.POST,
		method: 'POST',
		body: { name: 42 },
		paths: ['name']
	},
	{
		name: 'create: nothing at all',
		routeId: '/api/workspaces/[ws]/maps',
		handler: mapsRoute.POST,
		method: 'POST',
		body: {},
		paths: ['name']
	},
	{
		name: 'draft: version missing, signal length a string',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/draft',
		handler: draftRoute.PUT,
		method: 'PUT',
		body: {
			draft: {
				format: 'framewright-map@1',
				name: 'M',
				frames: [{ name: 'F', id: '0x100', signals: [{ name: 'S', startBit: 0, length: '8' }] }]
			}
		},
		paths: ['draft.frames.0.signals.0.length', 'version']
	},
	{
		name: 'draft: unknown field inside a frame',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/draft',
		handler: draftRoute.PUT,
		method: 'PUT',
		body: {
			version: 1,
			draft: { format: 'framewright-map@1', name: 'M', frames: [{ name: 'F', id: 1, dlc: 8 }] }
		},
		paths: ['draft.frames.0']
	},
	{
		name: 'draft: body not JSON',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/draft',
		handler: draftRoute.PUT,
		method: 'PUT',
		body: 'not json',
		paths: ['(root)']
	},
	{
		name: 'rename: empty name',
		routeId: '/api/workspaces/[ws]/maps/[mapId]',
		handler: mapRoute.PATCH,
		method: 'PATCH',
		body: { name: ' ', version: 1 },
		paths: ['name']
	},
	{
		name: 'publish: empty note, version as text',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions',
		handler: revisionsRoute.POST,
		method: 'POST',
		body: { note: '  ', version: '1' },
		paths: ['note', 'version']
	},
	{
		name: 'publish: unknown field',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions',
		handler: revisionsRoute.POST,
		method: 'POST',
		body: { note: 'x', version: 1, force: true },
		paths: ['(root)']
	},
	{
		name: 'restore: revision 0',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/restore',
		handler: restoreRoute.POST,
		method: 'POST',
		body: { revision: 0, version: 1 },
		paths: ['revision']
	},
	{
		name: 'share link: bad expiry',
		routeId: '/api/workspaces/[ws]/maps/[mapId]/share-links',
		handler: shareLinksRoute.POST,
		method: 'POST',
		body: { revision: 1, expiresAt: 'next week' },
		paths: ['expiresAt']
	}
];

describe('bad input to the map API', () => {
	it.each(badInput)('$name → 400 with paths, nothing stored', async (c) => {
		const w = await buildWorld();
		const before = await snapshot(w);
		const response = await call(w, c.handler, c.routeId, 'owner', {
			method: c.method,
			body: c.body
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.issues.map((i) => i.path).sort()).toEqual(c.paths);
		expect(body.issues.every((i) => i.message.length > 0)).toBe(true);
		expect(await snapshot(w)).toEqual(before);
	});

	it('diff with a bad revision parameter → 400 naming it', async () => {
		const w = await buildWorld();
		const response = await call(
			w,
			diffRoute.GET,
			'/api/workspaces/[ws]/maps/[mapId]/diff',
			'viewer',
			{ query: '?from=latest&to=draft' }
		);
		expect(response.status).toBe(400);
		expect(
			((await response.json()) as { issues: { path: string }[] }).issues.map((i) => i.path)
		).toEqual(['from']);
	});

	it('a malformed map file reports every problem by JSON path and stores nothing', async () => {
		const w = await buildWorld();
		const before = await snapshot(w);
		const broken = JSON.parse(clubRacerJson) as {
			frames: { id: unknown; length: unknown; signals: { length: unknown; colour?: string }[] }[];
		};
		broken.frames[0].id = '0xZZZ';
		broken.frames[1].length = 9;
		broken.frames[2].signals[1].length = 0;
		broken.frames[3].signals[0].colour = 'red';
		const response = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
			method: 'POST',
			body: { mapJson: JSON.stringify(broken) }
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.error).toBe('The map file has 4 problems; nothing was imported.');
		expect(body.issues.map((i) => i.path)).toEqual([
			'frames[0].id',
			'frames[1].length',
			'frames[2].signals[1].length',
			'frames[3].signals[0]'
		]);
		expect(await snapshot(w)).toEqual(before);
	});

	it('a map file with a JSON syntax error reports its line and column', async () => {
		const w = await buildWorld();
		const response = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
			method: 'POST',
			body: { mapJson: '{\n  "format": "framewright-map@1",\n  "name": "x",,\n}' }
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as { issues: { line: number; column: number }[] };
		expect(body.issues[0]).toMatchObject({ line: 3 });
	});

	it('a malformed signal table reports every problem by line and column and stores nothing', async () => {
		const w = await buildWorld();
		const before = await snapshot(w);
		const csv = [
			'frame_name,frame_id,signal_name,start_bit,bit_length,scale',
			'Engine,0x100,Speed,0,16,0.5',
			'Engine,0x100,Temp,16,eight,1',
			'Engine,0x100,Load,24,8,lots',
			'Other,0x800x,Gear,0,4,1'
		].join('\n');
		const response = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
			method: 'POST',
			body: { name: 'From CSV', signalTableCsv: csv }
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; line: number; column: string }[];
		};
		expect(body.error).toBe('The signal table has 3 problems; nothing was imported.');
		expect(body.issues.map((i) => [i.line, i.column])).toEqual([
			[3, 'bit_length'],
			[4, 'scale'],
			[5, 'frame_id']
		]);
		expect(await snapshot(w)).toEqual(before);
	});
});

describe('the bit rate of a new map', () => {
	it('a blank map and a signal table take the chosen rate; a map file keeps its own', async () => {
		const w = await buildWorld();
		const create = (body: Record<string, unknown>) =>
			call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', { method: 'POST', body });
		const draftOf = async (response: Response) => {
			expect(response.status).toBe(201);
			const { map } = (await response.json()) as { map: { id: string } };
			return (await getMap({ ...w, mapId: map.id })).map.draft;
		};
		expect((await draftOf(await create({ name: 'Slow bus', bitrate: 250_000 }))).bitrate).toBe(
			250_000
		);
		const csv = ['frame_name,frame_id,signal_name,start_bit,bit_length', 'A,0x100,B,0,8'].join(
			'\n'
		);
		expect(
			(await draftOf(await create({ name: 'Table', signalTableCsv: csv, bitrate: 125_000 })))
				.bitrate
		).toBe(125_000);
		// A file that names its rate is not overridden behind the person's back.
		const refused = await create({ mapJson: clubRacerJson, bitrate: 125_000 });
		expect(refused.status).toBe(400);
		expect(((await refused.json()) as { issues: { path: string }[] }).issues[0].path).toBe(
			'bitrate'
		);
	});
});

// ------------------------------------------------------------------ drafts, publishing, revisions

describe('drafts and revisions', () => {
	it('refuses a stale save with 409 naming who changed it, and keeps their change', async () => {
		const w = await buildWorld();
		const draft = JSON.parse(clubRacerJson) as CanMapInput;
		const first = await saveDraft(w, { ...draft, name: 'Editor change' }, 1, 'editor');
		expect(first.status).toBe(200);
		expect(((await first.json()) as { version: number }).version).toBe(2);
		const stale = await saveDraft(w, { ...draft, name: 'Owner change' }, 1, 'owner');
		expect(stale.status).toBe(409);
		const body = (await stale.json()) as { error: string; currentVersion: number };
		expect(body.currentVersion).toBe(2);
		expect(body.error).toMatch(
			/^This map was changed by Editor at \d{4}-\d\d-\d\dT.* since you loaded it\. Reload to see their changes; your edit was not saved\.$/
		);
		expect((await getMap(w)).map.name).toBe('Editor change');
		const audit = await w.services.db
			.selectFrom('audit_log')
			.select('action')
			.where('action', '=', 'map.draft.save')
			.execute();
		expect(audit).toHaveLength(1);
	});

	it('saves a frame switched to J1939 in the editor, its composed ID and an SPN; refuses an SPN beyond 19 bits', async () => {
		const w = await buildWorld();
		const parsed = parseMap(clubRacerJson);
		if (!parsed.ok) throw new Error('fixture map does not parse');
		const draft = parsed.map;
		// The frame page's edits: extended, J1939 on, then PGN 61444 (EEC1) and SA 0 at priority 3 —
		// SAE J1939-21 layout gives 0x0CF00400 (from memory; also the check in src/lib/can/j1939.test.ts).
		let frame = setJ1939({ ...draft.frames[0], extended: true, id: 0x18000000 }, true);
		for (const [key, text] of [
			['priority', '3'],
			['pgn', '61444'],
			['sourceAddress', '0x00']
		] as const) {
			if (!frame.ok) throw new Error(frame.message);
			frame = editJ1939Field(frame.frame, key, text);
		}
		if (!frame.ok) throw new Error(frame.message);
		const signals = frame.frame.signals.map((s, i) => (i === 0 ? { ...s, spn: 190 } : s));
		const frames = [{ ...frame.frame, signals }, ...draft.frames.slice(1)];
		const saved = await saveDraft(w, { ...draft, frames }, 1);
		expect(saved.status).toBe(200);
		const view = await getMap(w);
		expect(view.map.draft.frames[0]).toMatchObject({ id: 0x0cf00400, extended: true, j1939: true });
		expect(view.map.draft.frames[0].signals[0].spn).toBe(190);

		// 524288 needs 20 bits: refused with the path and the 19-bit range, the draft stays as saved.
		const tooBig = structuredClone(frames);
		tooBig[0].signals[0].spn = 0x80000;
		const refused = await saveDraft(w, { ...draft, frames: tooBig }, 2);
		expect(refused.status).toBe(400);
		const body = (await refused.json()) as { issues: { path: string; message: string }[] };
		expect(body.issues).toEqual([
			expect.objectContaining({
				path: 'draft.frames.0.signals.0.spn',
				message: expect.stringMatching(/0…524287/)
			})
		]);
		expect((await getMap(w)).map.draft.frames[0].signals[0].spn).toBe(190);
	});

	it('refuses to publish while lint has errors (422 with the problems), then numbers revisions r1, r2', async () => {
		const w = await buildWorld();
		const draft = JSON.parse(clubRacerJson) as { frames: { signals: { startBit: number }[] }[] };
		draft.frames[0].signals[1].startBit = 8; // now overlaps EngineSpeed (bits 8–23)
		expect((await saveDraft(w, draft, 1)).status).toBe(200);
		const refused = await publish(w, 'Should not publish', 2);
		expect(refused.status).toBe(422);
		const body = (await refused.json()) as {
			error: string;
			issues: { code: string; path: string; severity: string }[];
		};
		expect(body.issues.length).toBeGreaterThan(0);
		expect(body.issues.every((i) => i.severity === 'error')).toBe(true);
		expect(body.issues.map((i) => i.code)).toContain('signal-overlap');
		expect(await countRows(w.services.db, 'map_revisions')).toBe(0);

		expect((await saveDraft(w, JSON.parse(clubRacerJson), 2)).status).toBe(200);
		const r1 = await publish(w, 'First release', 3);
		expect(r1.status).toBe(201);
		expect(((await r1.json()) as { revision: { number: number } }).revision.number).toBe(1);
		// The same draft version again is refused (publish-twice.test.ts); a saved draft is a new version.
		expect((await saveDraft(w, JSON.parse(clubRacerJson), 3)).status).toBe(200);
		const r2 = await publish(w, 'Same map again, second number', 4);
		expect(((await r2.json()) as { revision: { number: number } }).revision.number).toBe(2);
		expect((await getMap(w)).revisions.map((r) => [r.number, r.note])).toEqual([
			[2, 'Same map again, second number'],
			[1, 'First release']
		]);
	});

	it('refuses to publish a draft version the publisher has not seen (409)', async () => {
		const w = await buildWorld();
		expect((await saveDraft(w, JSON.parse(clubRacerJson), 1)).status).toBe(200);
		const response = await publish(w, 'From an old tab', 1);
		expect(response.status).toBe(409);
		expect(await countRows(w.services.db, 'map_revisions')).toBe(0);
	});

	it('e-mails every other member when a revision is published, with the note and a link', async () => {
		const w = await buildWorld();
		expect((await publish(w, 'Oil pressure limits for the new sender', 1)).status).toBe(201);
		expect(w.services.outbox.map((m) => m.to).sort()).toEqual([
			'owner@example.test',
			'viewer@example.test'
		]);
		for (const mail of w.services.outbox) {
			expect(mail.subject).toBe('r1 of "Club racer engine controller" published');
			expect(mail.text).toContain('Oil pressure limits for the new sender');
			expect(mail.text).toContain(`http://localhost/w/${w.slug}/maps/${w.mapId}/revisions/1`);
		}
		const audit = await w.services.db
			.selectFrom('audit_log')
			.select(['action', 'details'])
			.where('action', '=', 'map.publish')
			.executeTakeFirstOrThrow();
		expect(JSON.parse(audit.details)).toMatchObject({
			revision: 1,
			note: 'Oil pressure limits for the new sender'
		});
	});

	it('restores an old revision into the draft as a new version', async () => {
		const w = await buildWorld();
		await publish(w, 'r1', 1);
		const changed = JSON.parse(clubRacerJson) as { frames: unknown[] };
		changed.frames.pop();
		expect((await saveDraft(w, changed, 1)).status).toBe(200);
		const restored = await call(
			w,
			restoreRoute.POST,
			'/api/workspaces/[ws]/maps/[mapId]/restore',
			'editor',
			{ method: 'POST', body: { revision: 1, version: 2 } }
		);
		expect(restored.status).toBe(200);
		expect(await restored.json()).toEqual({ version: 3 });
		const revision = (await (
			await call(
				w,
				revisionRoute.GET,
				'/api/workspaces/[ws]/maps/[mapId]/revisions/[n]',
				'viewer',
				{ params: { n: '1' } }
			)
		).json()) as { revision: { map: CanMap } };
		expect((await getMap(w)).map.draft).toEqual(revision.revision.map);
	});

	it('diff between revisions finds an added frame, a removed signal and a changed scale', async () => {
		const w = await buildWorld();
		await publish(w, 'r1', 1);
		const next = JSON.parse(clubRacerJson) as {
			frames: { name: string; id: string; signals: { name: string; scale: number }[] }[];
		};
		next.frames[0].signals[1].scale = 0.05; // ThrottlePosition
		next.frames[1].signals = next.frames[1].signals.filter((s) => s.name !== 'OilTemp');
		next.frames.push({ name: 'Brakes', id: '0x620', signals: [] });
		expect((await saveDraft(w, next, 1)).status).toBe(200);
		await publish(w, 'r2', 2);
		const response = await call(
			w,
			diffRoute.GET,
			'/api/workspaces/[ws]/maps/[mapId]/diff',
			'viewer',
			{ query: '?from=1&to=2' }
		);
		const { diff } = (await response.json()) as { diff: MapDiff };
		expect(diff.frames.find((f) => f.key === '0x620')).toMatchObject({
			status: 'added',
			name: 'Brakes'
		});
		expect(diff.frames.find((f) => f.key === '0x5F1')?.signals).toEqual([
			{ name: 'OilTemp', status: 'removed', changes: [] }
		]);
		expect(diff.frames.find((f) => f.key === '0x5F0')?.signals).toEqual([
			{
				name: 'ThrottlePosition',
				status: 'changed',
				changes: [{ field: 'scale', from: 0.1, to: 0.05 }]
			}
		]);
		expect(diff.frames.filter((f) => f.status === 'same').map((f) => f.key)).toEqual([
			'0x5F2',
			'0x5F3',
			'0x600',
			'0x610'
		]);
	});
});

// ------------------------------------------------------------------ exports and round trips

async function exportFile(w: World, query: string, actor: Actor = 'viewer'): Promise<Response> {
	return call(w, exportRoute.GET, '/w/[ws]/maps/[mapId]/export', actor, { query });
}

describe('exports', () => {
	it('the JSON export of a revision imports back as the same map', async () => {
		const w = await buildWorld();
		await publish(w, 'r1', 1);
		const file = await exportFile(w, '?rev=1&format=json');
		expect(file.status).toBe(200);
		expect(file.headers.get('x-framewright-revision')).toBe('r1');
		expect(file.headers.get('content-disposition')).toBe(
			'attachment; filename="club-racer-engine-controller-r1.map.json"'
		);
		const text = await file.text();
		const imported = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
			method: 'POST',
			body: { mapJson: text }
		});
		const { map } = (await imported.json()) as { map: { id: string } };
		const copy = await getMap({ ...w, mapId: map.id });
		const original = parseMap(clubRacerJson);
		expect(original.ok && copy.map.draft).toEqual(original.ok ? original.map : null);
	});

	it('the CSV signal table export of a revision imports back as the same map', async () => {
		const w = await buildWorld();
		await publish(w, 'r1', 1);
		const file = await exportFile(w, '?rev=r1&format=csv');
		expect(file.headers.get('content-disposition')).toBe(
			'attachment; filename="club-racer-engine-controller-r1.signals.csv"'
		);
		expect(file.headers.get('content-type')).toMatch(/^text\/csv/);
		const imported = await call(w, mapsRoute.POST, '/api/workspaces/[ws]/maps', 'editor', {
			method: 'POST',
			body: { name: 'Club racer engine controller', signalTableCsv: await file.text() }
		});
		expect(imported.status).toBe(201);
		const { map } = (await imported.json()) as { map: { id: string } };
		const original = parseMap(clubRacerJson);
		// The signal table leaves alert rules out (the JSON format carries them).
		expect(original.ok && (await getMap({ ...w, mapId: map.id })).map.draft).toEqual(
			original.ok ? { ...original.map, alertRules: [] } : null
		);
	});

	it('exports the draft by default and refuses an unknown format or revision', async () => {
		const w = await buildWorld();
		const draft = await exportFile(w, '');
		expect(draft.headers.get('x-framewright-revision')).toBe('draft');
		await expect(exportFile(w, '?format=xml')).rejects.toMatchObject({ status: 400 });
		await expect(exportFile(w, '?rev=7')).rejects.toMatchObject({ status: 404 });
		await expect(exportFile(w, '', 'outsider')).rejects.toMatchObject({ status: 404 });
	});
});
