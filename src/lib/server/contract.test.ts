// The API contract (src/lib/api/endpoints.ts) checked against the routes themselves: every route
// file answers the endpoints listed for it and nothing else, and a journey through every endpoint,
// run as the server runs it (real handlers, a freshly migrated database, temporary storage, the
// capture parsed in a worker thread), gets answers that the contract's own schemas accept with
// nothing left over, with the listed status. Failures met on the way must be listed failures with
// the listed body shape. The demo fixtures (invented data) are the inputs. Every JSON answer met on the
// way is then validated against the generated OpenAPI document (src/lib/api/openapi.ts) with ajv's
// JSON Schema draft 2020-12 validator, so the published description matches what the routes send.
import { rmSync } from 'node:fs';
import type { RequestEvent } from '@sveltejs/kit';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import { afterAll, describe, expect, it } from 'vitest';
import { endpointUrl, type CallInput } from '$lib/api/client';
import { endpoints, type EndpointName } from '$lib/api/endpoints';
import { openApiDocument } from '$lib/api/openapi';
import { problemBodySchema, type ErrorStatus } from '$lib/api/problem';
import { processingDone } from './captures/processing';
import type { SessionUser } from './guard';
import {
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	makeEvent,
	type TestServices
} from './test-support';

const routeModules = import.meta.glob<Record<string, unknown>>('../../routes/**/+server.ts');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** `/api/workspaces/{ws}/maps` ⇄ `../../routes/api/workspaces/[ws]/maps/+server.ts`. */
const fileOf = (template: string) =>
	`../../routes${template.replace(/\{(\w+)\}/g, '[$1]')}/+server.ts`;
const templateOf = (file: string) =>
	file
		.replace(/^\.\.\/\.\.\/routes/, '')
		.replace(/\/\+server\.ts$/, '')
		.replace(/\[(\w+)\]/g, '{$1}');

describe('the endpoint list matches the route files', () => {
	it('lists every method of every JSON route under /api, and each listed endpoint exists', async () => {
		const listed = new Set(Object.values(endpoints).map((e) => `${e.method} ${e.path}`));
		const exported = new Set<string>();
		for (const [file, load] of Object.entries(routeModules)) {
			const module = await load();
			for (const method of METHODS)
				if (typeof module[method] === 'function') exported.add(`${method} ${templateOf(file)}`);
		}
		const apiRoutes = [...exported].filter((e) => e.split(' ')[1].startsWith('/api/'));
		expect(apiRoutes.filter((e) => !listed.has(e))).toEqual([]);
		expect([...listed].filter((e) => !exported.has(e))).toEqual([]);
		expect(apiRoutes.length).toBeGreaterThan(30);
	});

	it('names the failures the guard answers for the access it declares', () => {
		for (const [name, e] of Object.entries(endpoints)) {
			if (e.access === 'public') continue;
			expect(Object.keys(e.errors), name).toContain('401');
			if (e.access !== 'signed-in') expect(Object.keys(e.errors), name).toContain('404');
			if (e.access === 'editor' || e.access === 'owner')
				expect(Object.keys(e.errors), name).toContain('403');
		}
	});
});

// ---- the journey ----

const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

interface Answer {
	status: number;
	body: unknown;
	response: Response;
}

/** Every JSON answer of the journeys, to check against the OpenAPI document at the end. */
const answers: { name: EndpointName; status: number; body: unknown }[] = [];

/** Calls an endpoint's handler the way SvelteKit would and checks the answer against the contract. */
async function call<K extends EndpointName>(
	services: TestServices,
	user: SessionUser | null,
	name: K,
	input: CallInput<K>
): Promise<Answer> {
	const def = endpoints[name];
	const {
		params = {},
		query,
		body
	} = input as {
		params?: Record<string, string | number>;
		query?: Record<string, unknown>;
		body?: unknown;
	};
	const module = await routeModules[fileOf(def.path)]();
	const handler = module[def.method] as (event: RequestEvent) => Promise<Response>;
	const path = endpointUrl(name, { params, query } as never);
	const response = await handler(
		makeEvent<RequestEvent>({
			services,
			user,
			routeId: def.path.replace(/\{(\w+)\}/g, '[$1]'),
			params: Object.fromEntries(Object.entries(params).map(([k, v]) => [k, String(v)])),
			method: def.method,
			body,
			path
		})
	);
	let parsedBody: unknown = undefined;
	if (response.ok) {
		expect(response.status, `${name} answers its listed status`).toBe(def.status);
		if ('response' in def && def.response) {
			parsedBody = await response.clone().json();
			const checked = def.response.safeParse(parsedBody);
			expect(checked.error?.issues ?? [], `${name} answers its listed shape`).toEqual([]);
			// Nothing beyond the contract: the schema keeps every field the route sent.
			expect(checked.data, `${name} sends no field the contract leaves out`).toEqual(parsedBody);
		} else if (def.status === 204) {
			expect(await response.text()).toBe('');
		}
	} else {
		const spec = def.errors[response.status as ErrorStatus];
		expect(spec, `${name} may answer ${response.status}`).toBeDefined();
		parsedBody = await response.clone().json();
		expect(problemBodySchema.safeParse(parsedBody).success).toBe(true);
		expect(spec!.body.safeParse(parsedBody).success, `${name} ${response.status} body`).toBe(true);
	}
	if (parsedBody !== undefined) answers.push({ name, status: response.status, body: parsedBody });
	return { status: response.status, body: parsedBody, response };
}

describe('every endpoint answers as the contract says', () => {
	it('workspaces, members and invitations', async () => {
		const services = await createTestServices();
		worlds.push(services);
		const { workspace, users } = await createTeam(services.db, 'Contract team');
		const ws = workspace.slug;
		const { owner, viewer } = users;

		await call(services, owner, 'workspaces.list', {});
		const created = await call(services, owner, 'workspaces.create', {
			body: { name: 'Second team' }
		});
		const second = (created.body as { workspace: { slug: string } }).workspace.slug;
		await call(services, owner, 'workspaces.rename', {
			params: { ws: second },
			body: { name: 'Second team, renamed' }
		});
		await call(services, owner, 'workspaces.delete', { params: { ws: second } });
		expect((await call(services, null, 'workspaces.list', {})).status).toBe(401);

		await call(services, viewer, 'members.list', { params: { ws } });
		const invited = await call(services, owner, 'invitations.create', {
			params: { ws },
			body: { email: 'new@example.test', role: 'viewer' }
		});
		expect(services.outbox.at(-1)?.to).toBe('new@example.test');
		const invitationId = (invited.body as { invitation: { id: string } }).invitation.id;
		await call(services, owner, 'invitations.revoke', { params: { ws, id: invitationId } });
		expect(
			(
				await call(services, owner, 'invitations.create', {
					params: { ws },
					body: { email: 'not an address', role: 'viewer' }
				})
			).status
		).toBe(400);

		await call(services, owner, 'members.changeRole', {
			params: { ws, userId: viewer.id },
			body: { role: 'editor' }
		});
		expect(
			(
				await call(services, owner, 'members.changeRole', {
					params: { ws, userId: owner.id },
					body: { role: 'viewer' }
				})
			).status
		).toBe(409);
		await call(services, owner, 'members.remove', { params: { ws, userId: viewer.id } });
		expect((await call(services, viewer, 'members.list', { params: { ws } })).status).toBe(404);
	});

	it('maps, revisions, share links and downloads', async () => {
		const services = await createTestServices();
		worlds.push(services);
		const { workspace, users } = await createTeam(services.db, 'Contract team');
		const ws = workspace.slug;
		const { owner, editor, viewer } = users;

		const created = await call(services, editor, 'maps.create', {
			params: { ws },
			body: { mapJson: fixtureText('club-racer-ecu.map.json') }
		});
		const mapId = (created.body as { map: { id: string } }).map.id;
		await call(services, viewer, 'maps.list', { params: { ws } });
		await call(services, viewer, 'maps.get', { params: { ws, mapId } });
		expect(
			(await call(services, viewer, 'maps.get', { params: { ws, mapId: 'nope' } })).status
		).toBe(404);
		expect(
			(await call(services, viewer, 'maps.create', { params: { ws }, body: { name: 'Blank' } }))
				.status
		).toBe(403);

		const club = fixtureMap('club-racer-ecu.map.json');
		const saved = await call(services, editor, 'maps.saveDraft', {
			params: { ws, mapId },
			body: { version: 1, draft: { ...club, bitrate: 250_000 } }
		});
		expect(saved.body).toMatchObject({ version: 2 });
		const stale = await call(services, editor, 'maps.saveDraft', {
			params: { ws, mapId },
			body: { version: 1, draft: club }
		});
		expect(stale.body).toMatchObject({ currentVersion: 2 });
		await call(services, editor, 'maps.rename', {
			params: { ws, mapId },
			body: { name: 'Club racer controller', version: 2 }
		});
		await call(services, editor, 'maps.publish', {
			params: { ws, mapId },
			body: { note: 'First release', version: 3 }
		});
		await call(services, viewer, 'maps.revisions', { params: { ws, mapId } });
		await call(services, viewer, 'maps.revision', { params: { ws, mapId, n: 1 } });
		await call(services, viewer, 'maps.diff', {
			params: { ws, mapId },
			query: { from: 1, to: 'draft' }
		});
		expect(
			(
				await call(services, viewer, 'maps.diff', {
					params: { ws, mapId },
					query: { from: 'latest', to: 'draft' }
				})
			).status
		).toBe(400);
		await call(services, editor, 'maps.restore', {
			params: { ws, mapId },
			body: { revision: 1, version: 3 }
		});

		const shared = await call(services, editor, 'maps.createShareLink', {
			params: { ws, mapId },
			body: { revision: 1, expiresAt: null }
		});
		const link = (shared.body as { shareLink: { id: string; url: string } }).shareLink;
		await call(services, viewer, 'maps.shareLinks', { params: { ws, mapId } });
		const token = new URL(link.url).pathname.split('/').at(-1)!;
		const sharedFile = await call(services, null, 'share.export', {
			params: { token },
			query: { format: 'csv' }
		});
		expect(sharedFile.response.headers.get('content-type')).toMatch(/^text\/csv/);
		await call(services, editor, 'maps.revokeShareLink', { params: { ws, mapId, id: link.id } });

		const file = await call(services, viewer, 'maps.export', {
			params: { ws, mapId },
			query: { rev: 1, format: 'json' }
		});
		expect(file.response.headers.get('x-framewright-revision')).toBe('r1');
		const code = await call(services, viewer, 'maps.codegen', {
			params: { ws, mapId },
			query: { rev: 1, file: 'h' }
		});
		expect(code.response.headers.get('content-disposition')).toContain('fw.h');
		const template = await call(services, viewer, 'maps.template', { params: { ws } });
		expect(await template.response.text()).toContain('\n');
		await call(services, viewer, 'tools.busLoad', {
			params: { ws },
			query: { mapId, rev: 1, bitrate: 250_000 }
		});

		await call(services, owner, 'maps.delete', { params: { ws, mapId } });
		await call(services, null, 'meta.openapi', {});
	});

	it('receiver profiles: drafts, links, revisions, relinking, checks and downloads', async () => {
		const services = await createTestServices();
		worlds.push(services);
		const { workspace, users } = await createTeam(services.db, 'Contract team');
		const ws = workspace.slug;
		const { owner, editor, viewer } = users;

		const createdMap = await call(services, editor, 'maps.create', {
			params: { ws },
			body: { mapJson: fixtureText('club-racer-ecu.map.json') }
		});
		const mapId = (createdMap.body as { map: { id: string } }).map.id;
		await call(services, editor, 'maps.publish', {
			params: { ws, mapId },
			body: { note: 'r1', version: 1 }
		});

		const created = await call(services, editor, 'receivers.create', {
			params: { ws },
			body: { profileJson: fixtureText('dash-display.profile.json') }
		});
		const profileId = (created.body as { profile: { id: string } }).profile.id;
		expect(
			(
				await call(services, editor, 'receivers.create', {
					params: { ws },
					body: { profileJson: '{"format": "framewright-profile@1"}' }
				})
			).status
		).toBe(400);
		await call(services, viewer, 'receivers.list', { params: { ws } });
		const got = await call(services, viewer, 'receivers.get', { params: { ws, profileId } });
		const { profile } = (got.body as { profile: { draft: { profile: never } } }).profile.draft;
		const target = { mapId, revision: 1 };

		const suggested = await call(services, editor, 'receivers.suggestLinks', {
			params: { ws, profileId },
			body: { profile, target }
		});
		const { report } = suggested.body as { report: { links: { link: never }[] } };
		await call(services, editor, 'receivers.manualLink', {
			params: { ws, profileId },
			body: {
				wanted: { name: 'Fuel level', quantity: 'percent', unit: '%' },
				target,
				frame: 'EngineCore',
				signal: 'NoSuchSignal'
			}
		});
		const draft = { profile, target, links: report.links.map((l) => l.link) };
		await call(services, editor, 'receivers.saveDraft', {
			params: { ws, profileId },
			body: { version: 1, draft }
		});
		const stale = await call(services, editor, 'receivers.saveDraft', {
			params: { ws, profileId },
			body: { version: 1, draft }
		});
		expect(stale.body).toMatchObject({ currentVersion: 2 });
		await call(services, editor, 'receivers.publish', {
			params: { ws, profileId },
			body: { note: 'First fit', version: 2 }
		});
		await call(services, viewer, 'receivers.revisions', { params: { ws, profileId } });
		await call(services, viewer, 'receivers.diff', {
			params: { ws, profileId },
			query: { from: 1, to: 'draft' }
		});

		await call(services, editor, 'maps.publish', {
			params: { ws, mapId },
			body: { note: 'r2, unchanged', version: 1 }
		});
		await call(services, viewer, 'receivers.relinkReview', {
			params: { ws, profileId },
			query: { to: 2 }
		});
		await call(services, editor, 'receivers.relink', {
			params: { ws, profileId },
			body: { version: 2, revision: 2, accept: [] }
		});

		const uploaded = await call(services, viewer, 'captures.upload', {
			params: { ws },
			query: { name: 'club-racer-session.csv' },
			body: fixtureText('club-racer-session.csv')
		} as never);
		const upload = uploaded.body as { capture: { id: string }; detected: { layout: unknown } };
		const id = upload.capture.id;
		expect(
			(
				await call(services, viewer, 'receivers.check', {
					params: { ws, profileId },
					body: { capture: id }
				})
			).status
		).toBe(409);
		await call(services, viewer, 'captures.process', {
			params: { ws, id },
			body: { layout: upload.detected.layout as never }
		});
		await processingDone(id);
		await call(services, viewer, 'receivers.check', {
			params: { ws, profileId },
			body: { capture: id, rev: 1 }
		});
		await call(services, viewer, 'receivers.alerts', {
			params: { ws, profileId },
			body: { capture: id }
		});
		const file = await call(services, viewer, 'receivers.export', {
			params: { ws, profileId },
			query: { rev: 1, format: 'receive-set' }
		});
		expect(file.response.headers.get('x-framewright-revision')).toBe('r1');

		await call(services, owner, 'receivers.delete', { params: { ws, profileId } });
	});

	it('captures: upload, processing, decodes, views, alerts and downloads', async () => {
		const services = await createTestServices();
		worlds.push(services);
		const { workspace, users } = await createTeam(services.db, 'Contract team');
		const ws = workspace.slug;
		const { editor, viewer } = users;

		// The map lacks its first frame, so that frame's ID is unknown to the decode.
		const club = fixtureMap('club-racer-ecu.map.json');
		const created = await call(services, editor, 'maps.create', {
			params: { ws },
			body: { mapJson: JSON.stringify({ ...club, frames: club.frames.slice(1) }) }
		});
		const mapId = (created.body as { map: { id: string } }).map.id;

		const uploaded = await call(services, viewer, 'captures.upload', {
			params: { ws },
			query: { name: 'club-racer-session.csv' },
			body: fixtureText('club-racer-session.csv')
		} as never);
		const upload = uploaded.body as {
			capture: { id: string };
			detected: { layout: unknown };
		};
		const id = upload.capture.id;
		await call(services, viewer, 'captures.list', { params: { ws } });
		await call(services, viewer, 'captures.process', {
			params: { ws, id },
			body: { layout: upload.detected.layout as never }
		});
		await processingDone(id);
		await call(services, viewer, 'captures.status', { params: { ws, id } });
		await call(services, viewer, 'captures.get', { params: { ws, id } });

		const decoded = await call(services, viewer, 'captures.decode', {
			params: { ws, id },
			body: { mapId, revision: 'draft' }
		});
		const { decode, summary } = decoded.body as {
			decode: { id: string };
			summary: { channels: { index: number }[]; unknownIds: { id: number; extended: boolean }[] };
		};
		await call(services, viewer, 'captures.getDecode', {
			params: { ws, id, decodeId: decode.id }
		});
		await call(services, viewer, 'captures.alerts', {
			params: { ws, id },
			body: { decode: decode.id }
		});
		await call(services, viewer, 'captures.frames', {
			params: { ws, id },
			query: { offset: 0, limit: 10 }
		});
		await call(services, viewer, 'captures.frame', {
			params: { ws, id, index: 0 },
			query: { decode: decode.id }
		});
		await call(services, viewer, 'captures.series', {
			params: { ws, id },
			query: { decode: decode.id, channel: summary.channels[0].index, points: 50 }
		});
		const csv = await call(services, viewer, 'captures.export', {
			params: { ws, id },
			query: { kind: 'long', decode: decode.id }
		});
		expect(csv.response.headers.get('x-framewright-revision')).toMatch(/^draft-v/);

		const [unknown] = summary.unknownIds;
		expect(unknown.id).toBe(club.frames[0].id);
		await call(services, editor, 'captures.defineFrame', {
			params: { ws, id },
			body: { decode: decode.id, id: unknown.id, extended: unknown.extended }
		});
		expect(
			(
				await call(services, viewer, 'captures.getDecode', {
					params: { ws, id, decodeId: 'no-such-decode' }
				})
			).status
		).toBe(404);

		// The workbench: derived channels and saved views, on a decode of the draft as defineFrame
		// left it (a draft decode names the draft version it read).
		const again = await call(services, viewer, 'captures.decode', {
			params: { ws, id },
			body: { mapId, revision: 'draft' }
		});
		const workbenchDecode = (again.body as { decode: { id: string } }).decode;
		const derived = await call(services, viewer, 'captures.derivedSeries', {
			params: { ws, id },
			query: { decode: workbenchDecode.id, formula: 'OilPressure * 2', points: 50 }
		});
		expect((derived.body as { count: number }).count).toBeGreaterThan(0);
		const badFormula = await call(services, viewer, 'captures.derivedSeries', {
			params: { ws, id },
			query: { decode: workbenchDecode.id, formula: 'OilPressure * * 2' }
		});
		expect(badFormula.status).toBe(400);
		expect((badFormula.body as { issues: { column: number }[] }).issues[0].column).toBe(15);
		const span = await call(services, viewer, 'captures.span', {
			params: { ws, id },
			query: {
				decode: workbenchDecode.id,
				formula: '{Pressures.OilPressure}',
				versus: 'FuelPressure',
				from: 1,
				to: 3,
				above: 300
			}
		});
		expect((span.body as { statistics: { count: number } }).statistics.count).toBeGreaterThan(10);
		const withDerived = await call(services, viewer, 'captures.exportDerived', {
			params: { ws, id },
			query: {
				kind: 'wide',
				decode: workbenchDecode.id,
				derived: JSON.stringify([{ name: 'Twice', unit: 'kPa', formula: 'OilPressure * 2' }])
			}
		});
		expect(await withDerived.response.text()).toMatch(/^time,.*Derived\.Twice \[kPa\]\n/);
		const saved = await call(services, viewer, 'captures.saveView', {
			params: { ws, id },
			body: {
				name: 'Oil',
				state: { strips: [['c0', 'd0']], derived: [{ name: 'Twice', formula: 'OilPressure * 2' }] }
			}
		});
		const viewId = (saved.body as { id: string }).id;
		await call(services, viewer, 'captures.views', { params: { ws, id } });
		expect(
			(await call(services, editor, 'captures.deleteView', { params: { ws, id, viewId } })).status
		).toBe(403);
		await call(services, viewer, 'captures.deleteView', { params: { ws, id, viewId } });

		await call(services, viewer, 'captures.delete', { params: { ws, id } });
	});
});

describe('the OpenAPI document describes the answers', () => {
	it('validates every JSON answer of the journeys above against its operation’s response', () => {
		const document = openApiDocument();
		const id = 'https://framewright.test/openapi.json';
		const ajv = new Ajv2020({ strict: false, allErrors: true });
		addFormats.default(ajv);
		ajv.addSchema({ ...document, $id: id });
		// JSON Pointer (RFC 6901) of a response schema, percent-encoded for the URI fragment.
		const pointer = (...parts: string[]) =>
			parts.map((p) => encodeURIComponent(p.replaceAll('~', '~0').replaceAll('/', '~1'))).join('/');
		expect(answers.length).toBeGreaterThan(40);
		const statuses = new Set<string>();
		for (const { name, status, body } of answers) {
			const def = endpoints[name];
			const fragment = pointer(
				'paths',
				def.path,
				def.method.toLowerCase(),
				'responses',
				String(status),
				'content',
				'application/json',
				'schema'
			);
			const validate = ajv.getSchema(`${id}#/${fragment}`);
			expect(validate, `${name} ${status} is in the document`).toBeTypeOf('function');
			const ok = validate!(body);
			expect(validate!.errors ?? [], `${name} ${status}`).toEqual([]);
			expect(ok).toBe(true);
			statuses.add(`${name} ${status}`);
		}
		// Failures were met too, and the schemas are strict enough to refuse a wrong answer.
		expect([...statuses].some((s) => s.endsWith(' 409'))).toBe(true);
		const list = ajv.getSchema(
			`${id}#/${pointer('paths', '/api/workspaces/{ws}/maps', 'get', 'responses', '200', 'content', 'application/json', 'schema')}`
		)!;
		expect(list({ maps: [{ id: 'm', name: 'x' }] })).toBe(false);
		expect(list({ maps: [], extra: true })).toBe(false);
	});
});
