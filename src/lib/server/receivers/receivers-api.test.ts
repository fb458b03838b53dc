// The receiver profile JSON API run as the server runs it: real route handlers, a freshly migrated
// in-memory database, hand-built request events. Profiles, maps and the capture are the demo
// fixtures (invented data); expected figures are computed here from those files and from the
// sources named beside them, never copied from the code under test.
import { rmSync } from 'node:fs';
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, describe, expect, it } from 'vitest';
import type { ProfileDraft, ProfileView, RelinkReview } from '$lib/api/receivers';
import type { CanMap } from '$lib/can/map';
import type { LinkReport } from '$lib/can/receivers/linking';
import { parseProfile } from '$lib/can/receivers/profile';
import type { ReceiveSet } from '$lib/can/receivers/receive-set';
import type { CaptureCheck } from '$lib/can/receivers/check';
import type { AlertReplay } from '$lib/can/alerts/replay';
import * as listRoute from '../../../routes/api/workspaces/[ws]/receivers/+server';
import * as profileRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/+server';
import * as draftRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/draft/+server';
import * as revisionsRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/revisions/+server';
import * as diffRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/diff/+server';
import * as suggestRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/links/suggestions/+server';
import * as manualRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/links/manual/+server';
import * as relinkRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/relink/+server';
import * as checkRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/check/+server';
import * as alertsRoute from '../../../routes/api/workspaces/[ws]/receivers/[profileId]/alerts/+server';
import * as relinkPage from '../../../routes/w/[ws]/receivers/[profileId]/relink/+page.server';
import * as exportRoute from '../../../routes/w/[ws]/receivers/[profileId]/export/+server';
import { importCaptureInProcess } from '../captures/processing';
import type { SessionUser } from '../guard';
import type { Role } from '../../roles';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	makeEvent,
	outcome,
	type TestServices
} from '../test-support';

type Handler = (event: RequestEvent) => Promise<Response>;
type Actor = Role | 'outsider' | 'signed-out';

const club = fixtureMap('club-racer-ecu.map.json');
const dashJson = fixtureText('dash-display.profile.json');

const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

interface World {
	services: TestServices;
	slug: string;
	workspaceId: string;
	users: Record<Role | 'outsider', SessionUser>;
	mapId: string;
	profileId: string;
}

interface CallOptions {
	method?: string;
	body?: unknown;
	params?: Record<string, string>;
	query?: string;
}

function call(
	w: World,
	handler: unknown,
	routeId: string,
	actor: Actor,
	options: CallOptions = {}
) {
	const params: Record<string, string> = { ws: w.slug, profileId: w.profileId, ...options.params };
	const path =
		routeId.replace(/\[(\w+)\]/g, (_, name: string) => params[name] ?? name) +
		(options.query ?? '');
	return (handler as Handler)(
		makeEvent({
			services: w.services,
			user: actor === 'signed-out' ? null : w.users[actor],
			routeId,
			params,
			path,
			method: options.method ?? 'GET',
			body: options.body
		})
	);
}

const R = '/api/workspaces/[ws]/receivers/[profileId]';

/** A team with the club racer map published as r1 and the dash display profile imported. */
async function buildWorld(profileJson = dashJson): Promise<World> {
	const services = await createTestServices();
	worlds.push(services);
	const { workspace, users } = await createTeam(services.db, 'Receiver team', {
		editor: 'Ed Itor'
	});
	const mapId = await createPublishedMap(services.db, {
		workspaceId: workspace.id,
		actorId: users.editor.id,
		revisions: [club]
	});
	const w: World = {
		services,
		slug: workspace.slug,
		workspaceId: workspace.id,
		users,
		mapId,
		profileId: ''
	};
	const created = await call(w, listRoute.POST, '/api/workspaces/[ws]/receivers', 'editor', {
		method: 'POST',
		body: { profileJson }
	});
	expect(created.status).toBe(201);
	w.profileId = ((await created.json()) as { profile: { id: string } }).profile.id;
	return w;
}

async function view(w: World): Promise<ProfileView> {
	const response = await call(w, profileRoute.GET, R, 'viewer');
	expect(response.status).toBe(200);
	return response.json();
}

async function suggest(w: World, draft: ProfileDraft, revision = 1): Promise<LinkReport> {
	const response = await call(w, suggestRoute.POST, `${R}/links/suggestions`, 'editor', {
		method: 'POST',
		body: { profile: draft.profile, target: { mapId: w.mapId, revision } }
	});
	expect(response.status).toBe(200);
	return ((await response.json()) as { report: LinkReport }).report;
}

function save(w: World, draft: unknown, version: number, actor: Actor = 'editor') {
	return call(w, draftRoute.PUT, `${R}/draft`, actor, {
		method: 'PUT',
		body: { version, draft }
	});
}

/** The dash display linked automatically to r1 and saved (version 2). */
async function linkedWorld(): Promise<{ w: World; draft: ProfileDraft }> {
	const w = await buildWorld();
	const { profile } = (await view(w)).profile.draft;
	const report = await suggest(w, { profile, target: null, links: [] });
	const draft: ProfileDraft = {
		profile,
		target: { mapId: w.mapId, revision: 1 },
		links: report.links.map((l) => l.link)
	};
	const saved = await save(w, draft, 1);
	expect(saved.status).toBe(200);
	return { w, draft };
}

/**
 * r2 of the map: OilPressure renamed on the same bits (its map alert rule follows), CoolantTemp
 * rescaled to 0.5 °C/bit.
 */
async function publishRenamingR2(w: World): Promise<void> {
	const r2: CanMap = structuredClone(club);
	for (const f of r2.frames)
		for (const s of f.signals) {
			if (s.name === 'OilPressure') s.name = 'EngineOilPressure';
			if (s.name === 'CoolantTemp') s.scale = 0.5;
		}
	for (const rule of r2.alertRules)
		if (rule.channel.signal === 'OilPressure') rule.channel.signal = 'EngineOilPressure';
	const { saveDraft } = await import('../maps/drafts');
	const { publishRevision } = await import('../maps/revisions');
	const map = { workspaceId: w.workspaceId, mapId: w.mapId, actorId: w.users.editor.id };
	await saveDraft(w.services.db, { ...map, version: 1, draft: r2 });
	await publishRevision(w.services.db, { ...map, version: 2, note: 'r2' });
}

const auditActions = async (w: World) =>
	(
		await w.services.db
			.selectFrom('audit_log')
			.select('action')
			.where('workspace_id', '=', w.workspaceId)
			.orderBy('id')
			.execute()
	)
		.map((r) => r.action)
		.filter((a) => a.startsWith('receiver.'));

const storedRow = (w: World) =>
	w.services.db
		.selectFrom('receiver_profiles')
		.selectAll()
		.where('id', '=', w.profileId)
		.executeTakeFirstOrThrow();

describe('roles: editors edit, publish and link; viewers read', () => {
	it('lets a viewer read, refuses their edits with 403, hides the profile from outsiders', async () => {
		const w = await buildWorld();
		const { profile } = (await view(w)).profile.draft;
		expect((await call(w, listRoute.GET, '/api/workspaces/[ws]/receivers', 'viewer')).status).toBe(
			200
		);
		expect((await save(w, { profile, target: null, links: [] }, 1, 'viewer')).status).toBe(403);
		const denied = [
			call(w, listRoute.POST, '/api/workspaces/[ws]/receivers', 'viewer', {
				method: 'POST',
				body: { name: 'Logger' }
			}),
			call(w, revisionsRoute.POST, `${R}/revisions`, 'viewer', {
				method: 'POST',
				body: { note: 'x', version: 1 }
			}),
			call(w, suggestRoute.POST, `${R}/links/suggestions`, 'viewer', {
				method: 'POST',
				body: { profile, target: { mapId: w.mapId, revision: 1 } }
			}),
			call(w, relinkRoute.POST, `${R}/relink`, 'viewer', {
				method: 'POST',
				body: { version: 1, revision: 2 }
			}),
			call(w, profileRoute.DELETE, R, 'editor', { method: 'DELETE' })
		];
		for (const response of await Promise.all(denied)) expect(response.status).toBe(403);
		expect((await call(w, profileRoute.GET, R, 'outsider')).status).toBe(404);
		expect((await call(w, profileRoute.GET, R, 'signed-out')).status).toBe(401);
		// The owner may delete; the audit log keeps the trail.
		expect((await call(w, profileRoute.DELETE, R, 'owner', { method: 'DELETE' })).status).toBe(204);
		expect((await call(w, profileRoute.GET, R, 'viewer')).status).toBe(404);
		expect(await auditActions(w)).toEqual(['receiver.create', 'receiver.delete']);
	});
});

describe('creating profiles', () => {
	it('refuses a file naming a quantity its unit does not measure, with the path, and stores nothing', async () => {
		const w = await buildWorld();
		const bad = JSON.parse(dashJson);
		bad.wanted[1].unit = 'kPa'; // ECT is a temperature
		const response = await call(w, listRoute.POST, '/api/workspaces/[ws]/receivers', 'editor', {
			method: 'POST',
			body: { profileJson: JSON.stringify(bad) }
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.error).toMatch(/nothing was imported/);
		expect(body.issues).toEqual([
			{
				path: 'wanted[1].unit',
				message:
					'unit "kPa" does not measure temperature (it measures pressure); use one of °C, °F, K'
			}
		]);
		const count = await w.services.db
			.selectFrom('receiver_profiles')
			.select((eb) => eb.fn.countAll<number>().as('n'))
			.executeTakeFirstOrThrow();
		expect(Number(count.n)).toBe(1); // the one buildWorld made
	});

	it('creates a blank profile with a name and a kind', async () => {
		const w = await buildWorld();
		const response = await call(w, listRoute.POST, '/api/workspaces/[ws]/receivers', 'editor', {
			method: 'POST',
			body: { name: 'Pit logger', kind: 'logger' }
		});
		expect(response.status).toBe(201);
		const list = (await (
			await call(w, listRoute.GET, '/api/workspaces/[ws]/receivers', 'viewer')
		).json()) as { profiles: { name: string; kind: string; wantedCount: number }[] };
		expect(list.profiles.map((p) => [p.name, p.kind, p.wantedCount]).sort()).toEqual([
			['Club dash display', 'display', 13],
			['Pit logger', 'logger', 0]
		]);
	});
});

describe('linking', () => {
	it('links most channels automatically, keeps the link made by hand and lists the rest', async () => {
		const w = await buildWorld();
		const { profile } = (await view(w)).profile.draft;
		const report = await suggest(w, { profile, target: null, links: [] });
		const linked = Object.fromEntries(report.links.map((l) => [l.wanted, l.link]));
		expect(linked['Det count']).toMatchObject({
			frame: 'Pressures',
			signal: 'KnockLevel',
			manual: true
		});
		expect(linked['Oil pressure']).toMatchObject({ signal: 'OilPressure', manual: false });
		// λ → AFR for gasoline: × 14.7, the stoichiometric ratio by mass (common practice).
		expect(linked.AFR.conversion).toMatchObject({ kind: 'mixture', form: 'linear', scale: 14.7 });
		expect(report.unlinked.map((u) => u.wanted)).toEqual(['Fuel level']);
		expect(report.links.length).toBe(profile.wanted.length - 1);
	});

	it('links by hand, and refuses units that do not convert with both units named', async () => {
		const w = await buildWorld();
		const { profile } = (await view(w)).profile.draft;
		const ect = profile.wanted.find((x) => x.name === 'ECT')!;
		const target = { mapId: w.mapId, revision: 1 };
		const refused = await call(w, manualRoute.POST, `${R}/links/manual`, 'editor', {
			method: 'POST',
			body: { wanted: ect, target, frame: 'Pressures', signal: 'OilPressure' }
		});
		expect(refused.status).toBe(400);
		const problem = (await refused.json()) as { error: string };
		expect(problem.error).toBe(
			'cannot link "ECT" (°C) to Pressures · OilPressure (kPa): "kPa" measures pressure and "°C" measures temperature; they do not convert'
		);

		const fuel = profile.wanted.find((x) => x.name === 'Fuel level')!;
		const made = await call(w, manualRoute.POST, `${R}/links/manual`, 'editor', {
			method: 'POST',
			body: { wanted: fuel, target, frame: 'EngineCore', signal: 'ThrottlePosition' }
		});
		expect(made.status).toBe(200);
		expect(await made.json()).toMatchObject({
			link: { wanted: 'Fuel level', frame: 'EngineCore', manual: true, confidence: 1 }
		});
		const gone = await call(w, manualRoute.POST, `${R}/links/manual`, 'editor', {
			method: 'POST',
			body: { wanted: fuel, target, frame: 'EngineCore', signal: 'FuelLevel' }
		});
		expect(gone.status).toBe(400);
		expect(((await gone.json()) as { error: string }).error).toMatch(
			/has no signal "FuelLevel" \(removed or renamed\?\)/
		);
	});
});

describe('saving the draft', () => {
	it('stores a linked draft, audited, and answers a stale save with 409 naming who and when', async () => {
		const { w, draft } = await linkedWorld();
		const row = await storedRow(w);
		expect(row.draft_version).toBe(2);
		expect(row.map_id).toBe(w.mapId);
		expect(JSON.parse(row.links_json)).toHaveLength(draft.links.length);
		expect(await auditActions(w)).toContain('receiver.draft.save');

		const stale = await save(w, draft, 1);
		expect(stale.status).toBe(409);
		const body = (await stale.json()) as { error: string; currentVersion: number };
		expect(body.currentVersion).toBe(2);
		expect(body.error).toContain('This receiver profile was changed by Ed Itor at');
		expect((await storedRow(w)).draft_version).toBe(2);
	});

	it('refuses a link to a signal the revision does not have, saving nothing of the draft', async () => {
		const { w, draft } = await linkedWorld();
		const before = await storedRow(w);
		const audits = (await auditActions(w)).length;
		const i = draft.links.findIndex((l) => l.wanted === 'Oil pressure');
		const broken = {
			...draft,
			profile: { ...draft.profile, notes: 'this edit must not be stored either' },
			links: draft.links.map((l, k) => (k === i ? { ...l, signal: 'OilPress' } : l))
		};
		const response = await save(w, broken, 2);
		expect(response.status).toBe(400);
		const body = (await response.json()) as { issues: { path: string; message: string }[] };
		expect(body.issues).toEqual([
			{
				path: `draft.links.${i}.signal`,
				message: expect.stringMatching(
					/^In r1 of "Club racer engine controller": frame "Pressures" .* has no signal "OilPress" \(removed or renamed\?\)/
				)
			}
		]);
		expect(await storedRow(w)).toEqual(before);
		expect((await auditActions(w)).length).toBe(audits);
	});

	it('refuses a link whose conversion no longer fits the unit the channel shows', async () => {
		const { w, draft } = await linkedWorld();
		const psi = {
			...draft,
			profile: {
				...draft.profile,
				wanted: draft.profile.wanted.map((x) =>
					x.name === 'Oil pressure' ? { ...x, unit: 'psi' } : x
				)
			}
		};
		const response = await save(w, psi, 2);
		expect(response.status).toBe(400);
		const body = (await response.json()) as { issues: { path: string; message: string }[] };
		expect(body.issues).toHaveLength(1);
		expect(body.issues[0].path).toMatch(/^draft\.links\.\d+\.conversion$/);
		expect(body.issues[0].message).toContain('kPa → bar');
		expect(body.issues[0].message).toContain('link it again');
	});

	it('refuses a channel whose quantity its unit does not measure (the profile schema)', async () => {
		const { w, draft } = await linkedWorld();
		const wrong = {
			...draft,
			links: [],
			profile: {
				...draft.profile,
				manualLinks: [],
				wanted: draft.profile.wanted.map((x) => (x.name === 'MAP' ? { ...x, unit: '°C' } : x))
			}
		};
		const response = await save(w, wrong, 2);
		expect(response.status).toBe(400);
		const body = (await response.json()) as { issues: { path: string; message: string }[] };
		expect(body.issues).toEqual([
			{
				path: 'draft.profile.wanted.6.unit',
				message:
					'unit "°C" does not measure pressure (it measures temperature); use one of kPa, Pa, hPa, MPa, bar, mbar, psi, inHg, mmHg, atm, kgf/cm²'
			}
		]);
	});
});

describe('publishing, diff and relinking', () => {
	it('refuses to publish while a required channel is unlinked, then publishes r1', async () => {
		const { w, draft } = await linkedWorld();
		const noRpm = {
			...draft,
			links: draft.links.filter((l) => l.wanted !== 'RPM')
		};
		expect((await save(w, noRpm, 2)).status).toBe(200);
		const refused = await call(w, revisionsRoute.POST, `${R}/revisions`, 'editor', {
			method: 'POST',
			body: { note: 'First fit', version: 3 }
		});
		expect(refused.status).toBe(422);
		expect(((await refused.json()) as { error: string }).error).toMatch(
			/1 required wanted channel is not linked/
		);
		expect((await save(w, draft, 3)).status).toBe(200);
		const published = await call(w, revisionsRoute.POST, `${R}/revisions`, 'editor', {
			method: 'POST',
			body: { note: 'First fit', version: 4 }
		});
		expect(published.status).toBe(201);
		expect(await published.json()).toEqual({ revision: { number: 1 } });
		const diff = await call(w, diffRoute.GET, `${R}/diff`, 'viewer', { query: '?from=1&to=draft' });
		expect(await diff.json()).toMatchObject({ from: 'r1', to: 'draft', diff: { identical: true } });
		expect(await auditActions(w)).toContain('receiver.publish');
	});

	it('shows what a new map revision breaks and changes, and moves to it in one step', async () => {
		const { w } = await linkedWorld();
		await publishRenamingR2(w);

		expect((await view(w)).linkedMap).toMatchObject({ revision: 1, latestRevision: 2 });
		const reviewed = await call(w, relinkRoute.GET, `${R}/relink`, 'viewer');
		const review = (await reviewed.json()) as RelinkReview;
		expect(review).toMatchObject({ from: 1, to: 2, newer: [2] });
		const byName = Object.fromEntries(review.result.items.map((i) => [i.wanted, i]));
		expect(byName['Oil pressure'].status).toBe('broken');
		expect(byName['Oil pressure'].suggestion?.signal).toBe('EngineOilPressure');
		expect(byName.ECT.status).toBe('changed');
		expect(byName.ECT.changes).toEqual([
			{
				field: 'scale',
				from: club.frames
					.find((f) => f.name === 'EngineTemperatures')!
					.signals.find((s) => s.name === 'CoolantTemp')!.scale,
				to: 0.5
			}
		]);
		expect(review.result.counts.kept).toBe(review.result.items.length - 2);

		const stale = await call(w, relinkRoute.POST, `${R}/relink`, 'editor', {
			method: 'POST',
			body: { version: 1, revision: 2, accept: ['Oil pressure'] }
		});
		expect(stale.status).toBe(409);
		const moved = await call(w, relinkRoute.POST, `${R}/relink`, 'editor', {
			method: 'POST',
			body: { version: 2, revision: 2, accept: ['Oil pressure'] }
		});
		expect(moved.status).toBe(200);
		expect(await moved.json()).toMatchObject({ version: 3, revision: 2, accepted: 1, dropped: 0 });
		const after = (await view(w)).profile.draft;
		expect(after.target).toEqual({ mapId: w.mapId, revision: 2 });
		expect(after.links.find((l) => l.wanted === 'Oil pressure')?.signal).toBe('EngineOilPressure');
		expect(await auditActions(w)).toContain('receiver.relink');
	});
});

describe('bad relinks are refused whole, saving nothing', () => {
	/** The linked dash display with r2 of its map published: the draft is at version 2 on r1. */
	async function relinkWorld() {
		const { w } = await linkedWorld();
		await publishRenamingR2(w);
		return { w, before: await storedRow(w) };
	}

	it('names each channel that has no suggestion to take', async () => {
		const { w, before } = await relinkWorld();
		const response = await call(w, relinkRoute.POST, `${R}/relink`, 'editor', {
			method: 'POST',
			// Oil pressure is broken with a suggestion; ECT only changed; Fuel gauge is not in the profile.
			body: { version: 2, revision: 2, accept: ['Oil pressure', 'ECT', 'Fuel gauge'] }
		});
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.error).toBe('Some suggestions cannot be taken.');
		expect(body.issues.map((i) => i.path)).toEqual(['accept.1', 'accept.2']);
		expect(body.issues[0].message).toContain('"ECT" has no suggested signal to take on r2');
		expect(await storedRow(w)).toEqual(before);
		expect(await auditActions(w)).not.toContain('receiver.relink');
	});

	it('refuses the revision it is on already and one the map does not have', async () => {
		const { w, before } = await relinkWorld();
		const same = await call(w, relinkRoute.POST, `${R}/relink`, 'editor', {
			method: 'POST',
			body: { version: 2, revision: 1, accept: [] }
		});
		expect(same.status).toBe(400);
		expect(((await same.json()) as { error: string }).error).toBe(
			'The profile is linked to r1 already; choose a newer revision.'
		);
		const missing = await call(w, relinkRoute.POST, `${R}/relink`, 'editor', {
			method: 'POST',
			body: { version: 2, revision: 7, accept: [] }
		});
		expect(missing.status).toBe(404);
		expect(((await missing.json()) as { error: string }).error).toBe(
			'This map has no revision r7.'
		);
		expect(await storedRow(w)).toEqual(before);
	});

	it('reads the relink form through the same schema, answers a stale draft with 409, then moves', async () => {
		const { w, before } = await relinkWorld();
		const submit = (fields: Record<string, string | string[]>) => {
			const form = new FormData();
			for (const [name, value] of Object.entries(fields))
				for (const v of [value].flat()) form.append(name, v);
			return relinkPage.actions.move(
				makeEvent({
					services: w.services,
					user: w.users.editor,
					routeId: '/w/[ws]/receivers/[profileId]/relink',
					params: { ws: w.slug, profileId: w.profileId },
					method: 'POST',
					body: form
				})
			);
		};
		const garbled = await submit({ version: 'two', revision: '2' });
		expect(garbled).toMatchObject({ status: 400, data: { issues: [{ path: 'version' }] } });
		const stale = await submit({ version: '1', revision: '2', accept: 'Oil pressure' });
		expect(stale).toMatchObject({ status: 409 });
		expect((stale as { data: { message: string } }).data.message).toMatch(
			/^This receiver profile was changed by .* since you loaded it\./
		);
		expect(await storedRow(w)).toEqual(before);

		const moved = await outcome(() =>
			submit({ version: '2', revision: '2', accept: 'Oil pressure' })
		);
		expect(moved).toEqual({
			kind: 'redirect',
			status: 303,
			location: `/w/${w.slug}/receivers/${w.profileId}?relinked=2`
		});
		const after = (await view(w)).profile.draft;
		expect(after.target).toEqual({ mapId: w.mapId, revision: 2 });
		expect(after.links.find((l) => l.wanted === 'Oil pressure')?.signal).toBe('EngineOilPressure');
	});
});

describe('on a capture, and the exports', () => {
	async function withCapture() {
		const linked = await linkedWorld();
		const captureId = await importCaptureInProcess(linked.w.services, {
			workspaceId: linked.w.workspaceId,
			actorId: linked.w.users.viewer.id,
			fileName: 'club-racer-session.csv',
			text: fixtureText('club-racer-session.csv')
		});
		return { ...linked, captureId };
	}

	it("reads like an installer's checklist, with sample counts taken from the CSV itself", async () => {
		const { w, captureId } = await withCapture();
		const response = await call(w, checkRoute.POST, `${R}/check`, 'viewer', {
			method: 'POST',
			body: { capture: captureId }
		});
		expect(response.status).toBe(200);
		const { check, map } = (await response.json()) as {
			check: CaptureCheck;
			map: { revision: number };
		};
		expect(map.revision).toBe(1);
		// Each EngineCore frame (ID 0x5F0) carries one RPM sample: count them in the CSV rows.
		const rows = fixtureText('club-racer-session.csv').trim().split('\n').slice(1);
		const engineCore = rows.filter((r) => r.split(',')[1].toUpperCase() === '5F0').length;
		const rpm = check.channels.find((c) => c.wanted === 'RPM')!;
		expect(rpm.samples).toBe(engineCore);
		expect(rpm.lines[0].sentence).toBe(
			`RPM arrives: ${engineCore} samples from EngineCore · EngineSpeed`
		);
		const fuel = check.channels.find((c) => c.wanted === 'Fuel level')!;
		expect(fuel.lines[0].sentence).toContain('Fuel level is not linked');

		const alerts = await call(w, alertsRoute.POST, `${R}/alerts`, 'viewer', {
			method: 'POST',
			body: { capture: captureId, acknowledgements: [{ ruleId: 'no-such-rule', time: 1 }] }
		});
		expect(alerts.status).toBe(400);
		const replayed = await call(w, alertsRoute.POST, `${R}/alerts`, 'viewer', {
			method: 'POST',
			body: { capture: captureId }
		});
		const replay = (await replayed.json()) as AlertReplay;
		expect(replay.rules.map((r) => r.id)).toEqual(['oil-pressure-low', 'coolant-hot']);
	});

	it('downloads a receive set whose scale is the map scale composed with the unit conversion', async () => {
		const { w } = await linkedWorld();
		const response = await call(
			w,
			exportRoute.GET,
			'/w/[ws]/receivers/[profileId]/export',
			'viewer',
			{
				query: '?rev=draft&format=receive-set'
			}
		);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-disposition')).toContain(
			'club-dash-display-draft.receive.json'
		);
		const set = JSON.parse(await response.text()) as ReceiveSet & { channels: { id: string }[] };
		const oil = set.channels.find((c) => c.name === 'Oil pressure')!;
		const signal = club.frames
			.find((f) => f.name === 'Pressures')!
			.signals.find((s) => s.name === 'OilPressure')!;
		// 1 bar = 100 kPa exactly (NIST SP 811, Appendix B.8: bar = 1.0E+05 Pa, kPa = 1.0E+03 Pa).
		expect(oil.scale).toBeCloseTo(signal.scale / 100, 12);
		expect(oil.offset).toBeCloseTo(signal.offset / 100, 12);
		expect(oil.id).toBe('0x5F2');
		expect(set.unlinked).toEqual([{ name: 'Fuel level', required: false }]);

		const file = await call(w, exportRoute.GET, '/w/[ws]/receivers/[profileId]/export', 'viewer', {
			query: '?format=profile'
		});
		expect(parseProfile(await file.text())).toMatchObject({
			ok: true,
			value: { name: 'Club dash display' }
		});
	});

	it('answers a download of an unlinked profile with the error page, not a file', async () => {
		const w = await buildWorld();
		const result = await outcome(() =>
			call(w, exportRoute.GET, '/w/[ws]/receivers/[profileId]/export', 'viewer')
		);
		expect(result).toMatchObject({ kind: 'error', status: 409 });
	});
});
