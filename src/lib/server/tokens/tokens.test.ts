// Access tokens against a freshly migrated database: how they are made and stored, what the guard
// lets them do on API routes, downloads, pages and form actions, and what the audit log keeps.
// SHA-256 is checked against node:crypto's own digest of the secret, computed here.
import { createHash } from 'node:crypto';
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as mapsRoute from '../../../routes/api/workspaces/[ws]/maps/+server';
import * as workspacesRoute from '../../../routes/api/workspaces/+server';
import * as mapExport from '../../../routes/w/[ws]/maps/[mapId]/export/+server';
import * as rootPage from '../../../routes/+page.server';
import * as tokensPage from '../../../routes/w/[ws]/tokens/+page.server';
import * as workspaceLayout from '../../../routes/w/[ws]/+layout.server';
import { withRequestContext } from '../request-context';
import {
	addMember,
	createPublishedMap,
	createTeam,
	createTestServices,
	createUser,
	fixtureMap,
	makeEvent,
	outcome,
	type TestServices
} from '../test-support';
import { createWorkspace } from '../workspaces/workspaces';
import { bearerOf } from './bearer';
import {
	createToken,
	LAST_USE_INTERVAL_MS,
	listTokens,
	MAX_ACTIVE_TOKENS,
	recordTokenUse,
	revokeToken,
	verifyToken
} from './tokens';

async function world() {
	const services = await createTestServices();
	const team = await createTeam(services.db, 'Token team');
	const other = await createWorkspace(services.db, {
		name: 'Other team',
		ownerId: team.users.outsider.id
	});
	// The editor belongs to the other workspace too, so a wrong-workspace token is a real member's.
	await addMember(services.db, other.id, team.users.editor.id, 'editor');
	return { services, ...team, other };
}

type World = Awaited<ReturnType<typeof world>>;

async function token(
	w: World,
	who: 'owner' | 'editor' | 'viewer',
	role: 'viewer' | 'editor',
	options: { expiresInDays?: number; workspaceId?: string; now?: Date } = {}
) {
	return createToken(w.services.db, {
		workspaceId: options.workspaceId ?? w.workspace.id,
		userId: w.users[who].id,
		name: `${who} ${role}`,
		role,
		expiresInDays: options.expiresInDays ?? 30,
		now: options.now
	});
}

/** Calls a route module's handler with `Authorization: Bearer <text>`, read as the pipeline reads it. */
async function withToken(
	services: TestServices,
	text: string,
	init: { routeId: string; params?: Record<string, string>; method?: string; body?: unknown }
) {
	const bearer = await bearerOf(services.db, `Bearer ${text}`);
	// Typed loosely: each route's handler wants its own RequestEvent type.
	return makeEvent<never>({
		services,
		user: null,
		bearer,
		headers: { authorization: `Bearer ${text}` },
		...init
	});
}

const auditRows = (services: TestServices) =>
	services.db.selectFrom('audit_log').selectAll().orderBy('id').execute();

describe('making, listing and revoking tokens', () => {
	it('shows the token once and stores only the SHA-256 of its secret', async () => {
		const w = await world();
		const { token: text, view } = await token(w, 'editor', 'editor');
		expect(text).toMatch(/^fwt_[0-9a-f]{16}_[A-Za-z0-9_-]{43}$/);
		const [, id, secret] = text.split(/^fwt_([0-9a-f]{16})_/);
		expect(view.id).toBe(id);
		const row = await w.services.db
			.selectFrom('access_tokens')
			.selectAll()
			.where('id', '=', id)
			.executeTakeFirstOrThrow();
		expect(row.secret_hash).toBe(createHash('sha256').update(secret).digest('hex'));
		expect(JSON.stringify(row)).not.toContain(secret);
		// The audit row names the token, never its secret.
		const audit = (await auditRows(w.services)).filter((r) => r.action === 'token.create');
		expect(audit).toHaveLength(1);
		expect(audit[0].details).not.toContain(secret);
		expect(audit[0].target).toBe(id);
	});

	it('refuses a role above the maker’s own, and more than the allowed number of active tokens', async () => {
		const w = await world();
		await expect(token(w, 'viewer', 'editor')).rejects.toMatchObject({ status: 403 });
		for (let i = 0; i < MAX_ACTIVE_TOKENS; i++) await token(w, 'viewer', 'viewer');
		await expect(token(w, 'viewer', 'viewer')).rejects.toMatchObject({ status: 409 });
		const first = (
			await listTokens(w.services.db, { workspaceId: w.workspace.id, userId: w.users.viewer.id })
		)[0];
		await revokeToken(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.viewer.id,
			id: first.id
		});
		await expect(token(w, 'viewer', 'viewer')).resolves.toBeDefined();
	});

	it('lists a person’s own tokens with their status; nobody else can revoke them', async () => {
		const w = await world();
		const now = new Date('2027-03-01T12:00:00Z');
		const a = await token(w, 'editor', 'viewer', { now, expiresInDays: 7 });
		const b = await token(w, 'editor', 'editor', {
			now: new Date(now.getTime() + 1000),
			expiresInDays: 30
		});
		await token(w, 'viewer', 'viewer', { now });
		await revokeToken(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.editor.id,
			id: b.view.id,
			now
		});
		await expect(
			revokeToken(w.services.db, {
				workspaceId: w.workspace.id,
				userId: w.users.owner.id,
				id: a.view.id
			})
		).rejects.toMatchObject({ status: 404 });
		const later = new Date(now.getTime() + 8 * 86_400_000);
		const listed = await listTokens(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.editor.id,
			now: later
		});
		expect(listed.map((t) => [t.name, t.status])).toEqual([
			['editor editor', 'revoked'],
			['editor viewer', 'expired']
		]);
		expect(listed[1].expiresAt).toBe('2027-03-08T12:00:00.000Z');
	});

	it('accepts a token only while it is valid: revoked, expired, altered and malformed ones look alike', async () => {
		const w = await world();
		const now = new Date('2027-03-01T12:00:00Z');
		const { token: text, view } = await token(w, 'editor', 'editor', { now, expiresInDays: 7 });
		expect((await verifyToken(w.services.db, text, now))?.user.id).toBe(w.users.editor.id);
		const day8 = new Date(now.getTime() + 7 * 86_400_000);
		expect(await verifyToken(w.services.db, text, day8)).toBeUndefined();
		const altered = text.slice(0, -1) + (text.endsWith('A') ? 'B' : 'A');
		expect(await verifyToken(w.services.db, altered, now)).toBeUndefined();
		expect(await verifyToken(w.services.db, 'fwt_nothing', now)).toBeUndefined();
		await revokeToken(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.editor.id,
			id: view.id,
			now
		});
		expect(await verifyToken(w.services.db, text, now)).toBeUndefined();
		expect(await bearerOf(w.services.db, `Bearer ${text}`, now)).toEqual({ ok: false });
		expect(await bearerOf(w.services.db, `Basic ${text}`, now)).toEqual({ ok: false });
		expect(await bearerOf(w.services.db, null, now)).toBeNull();
	});

	it('writes last use and a token.use audit row at most once a minute', async () => {
		const w = await world();
		const { token: text } = await token(w, 'viewer', 'viewer');
		const grant = (await verifyToken(w.services.db, text))!;
		const t0 = new Date('2027-03-01T12:00:00Z');
		const request = { method: 'GET', path: '/api/workspaces/x/maps' };
		await recordTokenUse(w.services.db, grant, request, t0);
		await recordTokenUse(w.services.db, grant, request, new Date(t0.getTime() + 30_000));
		await recordTokenUse(
			w.services.db,
			grant,
			request,
			new Date(t0.getTime() + LAST_USE_INTERVAL_MS)
		);
		const uses = (await auditRows(w.services)).filter((r) => r.action === 'token.use');
		expect(uses.map((u) => u.created_at.length > 0 && u.token_id)).toEqual([grant.id, grant.id]);
		const [listed] = await listTokens(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.viewer.id
		});
		expect(listed.lastUsedAt).toBe(new Date(t0.getTime() + LAST_USE_INTERVAL_MS).toISOString());
	});
});

describe('the guard with a token', () => {
	it('API routes accept it as its maker, at the token’s role, and audit the change with the token', async () => {
		const w = await world();
		const readOnly = await token(w, 'editor', 'viewer');
		const edit = await token(w, 'editor', 'editor');
		const routeId = '/api/workspaces/[ws]/maps';
		const params = { ws: w.workspace.slug };

		const listed = await mapsRoute.GET(
			await withToken(w.services, readOnly.token, { routeId, params })
		);
		expect(listed.status).toBe(200);
		expect(await listed.json()).toEqual({ maps: [] });

		// The editor's read-only token cannot do what the editor can.
		const body = { name: 'Made by a pipeline' };
		const refused = await mapsRoute.POST(
			await withToken(w.services, readOnly.token, { routeId, params, method: 'POST', body })
		);
		expect(refused.status).toBe(403);
		expect((await refused.json()).error).toMatch(/editor role.*access token’s role: viewer/);

		const made = await withRequestContext(async () =>
			mapsRoute.POST(
				await withToken(w.services, edit.token, { routeId, params, method: 'POST', body })
			)
		);
		expect(made.status).toBe(201);
		const create = (await auditRows(w.services)).find((r) => r.action === 'map.create');
		expect(create).toMatchObject({ actor_id: w.users.editor.id, token_id: edit.view.id });
		// A session's change carries no token.
		const sessionCreate = await withRequestContext(async () =>
			mapsRoute.POST(
				makeEvent<never>({
					services: w.services,
					user: w.users.editor,
					routeId,
					params,
					method: 'POST',
					body: { name: 'Made in the browser' }
				})
			)
		);
		expect(sessionCreate.status).toBe(201);
		const creates = (await auditRows(w.services)).filter((r) => r.action === 'map.create');
		expect(creates.map((r) => r.token_id)).toEqual([edit.view.id, null]);
	});

	it('a token follows its maker’s role down, and dies with the membership', async () => {
		const w = await world();
		const edit = await token(w, 'editor', 'editor');
		await w.services.db
			.updateTable('memberships')
			.set({ role: 'viewer' })
			.where('user_id', '=', w.users.editor.id)
			.where('workspace_id', '=', w.workspace.id)
			.execute();
		const routeId = '/api/workspaces/[ws]/maps';
		const params = { ws: w.workspace.slug };
		const demoted = await mapsRoute.POST(
			await withToken(w.services, edit.token, {
				routeId,
				params,
				method: 'POST',
				body: { name: 'x' }
			})
		);
		expect(demoted.status).toBe(403);
		await w.services.db
			.deleteFrom('memberships')
			.where('user_id', '=', w.users.editor.id)
			.where('workspace_id', '=', w.workspace.id)
			.execute();
		const gone = await mapsRoute.GET(await withToken(w.services, edit.token, { routeId, params }));
		expect(gone.status).toBe(404);
	});

	it('another workspace answers 404 exactly like a workspace that does not exist', async () => {
		const w = await world();
		const edit = await token(w, 'editor', 'editor');
		const routeId = '/api/workspaces/[ws]/maps';
		// The editor is a member of the other workspace, but this token is not for it.
		const other = await mapsRoute.GET(
			await withToken(w.services, edit.token, { routeId, params: { ws: w.other.slug } })
		);
		const missing = await mapsRoute.GET(
			await withToken(w.services, edit.token, { routeId, params: { ws: 'no-such-workspace' } })
		);
		expect(other.status).toBe(404);
		expect(await other.json()).toEqual(await missing.json());

		// The workspace list shows only the token's workspace, at the token's role.
		const list = await workspacesRoute.GET(
			await withToken(w.services, edit.token, { routeId: '/api/workspaces' })
		);
		expect(await list.json()).toEqual({
			workspaces: [
				{ id: w.workspace.id, slug: w.workspace.slug, name: w.workspace.name, role: 'editor' }
			]
		});
		// Creating a workspace needs the person.
		const create = await workspacesRoute.POST(
			await withToken(w.services, edit.token, {
				routeId: '/api/workspaces',
				method: 'POST',
				body: { name: 'Pipeline team' }
			})
		);
		expect(create.status).toBe(403);
	});

	it('revoked, expired and mistyped tokens get 401 with one message, even beside a session', async () => {
		const w = await world();
		const edit = await token(w, 'editor', 'editor');
		await revokeToken(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.editor.id,
			id: edit.view.id
		});
		const expired = await token(w, 'editor', 'viewer', {
			now: new Date(Date.now() - 8 * 86_400_000),
			expiresInDays: 7
		});
		const routeId = '/api/workspaces/[ws]/maps';
		const params = { ws: w.workspace.slug };
		const bodies = [];
		for (const text of [edit.token, expired.token, 'fwt_0123456789abcdef_nope']) {
			const event = await withToken(w.services, text, { routeId, params });
			(event as RequestEvent).locals.user = w.users.editor; // a valid session cookie came along
			const answer = await mapsRoute.GET(event);
			expect(answer.status).toBe(401);
			bodies.push(await answer.json());
		}
		expect(new Set(bodies.map((b) => JSON.stringify(b))).size).toBe(1);
		expect(JSON.stringify(bodies[0])).not.toMatch(/Other team|other-team/);
	});

	it('downloads of the contract accept a token; a bad one is a 401, not a sign-in redirect', async () => {
		const w = await world();
		const mapId = await createPublishedMap(w.services.db, {
			workspaceId: w.workspace.id,
			actorId: w.users.editor.id,
			revisions: [fixtureMap('club-racer-ecu.map.json')]
		});
		const readOnly = await token(w, 'viewer', 'viewer');
		const routeId = '/w/[ws]/maps/[mapId]/export';
		const params = { ws: w.workspace.slug, mapId };
		const file = await mapExport.GET(
			await withToken(w.services, readOnly.token, { routeId, params })
		);
		expect(file.status).toBe(200);
		expect(file.headers.get('x-framewright-revision')).toBe('draft');
		const bad = await outcome(async () =>
			mapExport.GET(await withToken(w.services, 'fwt_0123456789abcdef_nope', { routeId, params }))
		);
		expect(bad).toMatchObject({ kind: 'error', status: 401 });
	});

	it('pages and form actions refuse tokens, even valid ones', async () => {
		const w = await world();
		const edit = await token(w, 'editor', 'editor');
		const page = await outcome(async () =>
			workspaceLayout.load(
				await withToken(w.services, edit.token, {
					routeId: '/w/[ws]',
					params: { ws: w.workspace.slug }
				})
			)
		);
		expect(page).toMatchObject({ kind: 'error', status: 403 });

		const form = new FormData();
		form.set('name', 'Minted by a token');
		form.set('role', 'viewer');
		form.set('expiresInDays', '30');
		const action = await outcome(async () =>
			tokensPage.actions.create(
				(await withToken(w.services, edit.token, {
					routeId: '/w/[ws]/tokens',
					params: { ws: w.workspace.slug },
					method: 'POST',
					body: form
				})) as never
			)
		);
		expect(action).toMatchObject({ kind: 'error', status: 403 });

		const workspaceForm = new FormData();
		workspaceForm.set('name', 'Made with a token');
		const create = await outcome(async () =>
			rootPage.actions.create(
				(await withToken(w.services, edit.token, {
					routeId: '/',
					method: 'POST',
					body: workspaceForm
				})) as never
			)
		);
		expect(create).toMatchObject({ kind: 'error', status: 403 });
		const tokens = await listTokens(w.services.db, {
			workspaceId: w.workspace.id,
			userId: w.users.editor.id
		});
		expect(tokens).toHaveLength(1);
	});
});

describe('the tokens page', () => {
	it('creates a token once, shows it in the action result only, lists and revokes it', async () => {
		const services = await createTestServices();
		const viewer = await createUser(services.db, 'reader@example.test');
		const owner = await createUser(services.db, 'boss@example.test');
		const ws = await createWorkspace(services.db, { name: 'Page team', ownerId: owner.id });
		await addMember(services.db, ws.id, viewer.id, 'viewer');
		const event = (form?: FormData) =>
			makeEvent({
				services,
				user: viewer,
				routeId: '/w/[ws]/tokens',
				params: { ws: ws.slug },
				method: form ? 'POST' : 'GET',
				body: form
			}) as never;
		const form = (values: Record<string, string>) => {
			const f = new FormData();
			for (const [k, v] of Object.entries(values)) f.set(k, v);
			return f;
		};

		// A viewer asking for an edit token: refused on the access field.
		const tooHigh = await tokensPage.actions.create(
			event(form({ name: 'CI', role: 'editor', expiresInDays: '30' }))
		);
		expect(tooHigh).toMatchObject({
			status: 403,
			data: { errors: { role: [expect.any(String)] } }
		});
		const bad = await tokensPage.actions.create(
			event(form({ name: ' ', role: 'viewer', expiresInDays: '12' }))
		);
		expect(bad).toMatchObject({
			status: 400,
			data: { errors: { name: [expect.any(String)], expiresInDays: [expect.any(String)] } }
		});

		const made = (await tokensPage.actions.create(
			event(form({ name: 'CI', role: 'viewer', expiresInDays: '90' }))
		)) as { created: { id: string; token: string } };
		expect(made.created.token).toMatch(/^fwt_/);
		const loaded = (await tokensPage.load(event())) as { tokens: unknown[] };
		expect(JSON.stringify(loaded)).not.toContain(made.created.token.slice(-43));
		expect(loaded.tokens).toMatchObject([{ name: 'CI', role: 'viewer', status: 'active' }]);

		await tokensPage.actions.revoke(event(form({ id: made.created.id })));
		const after = (await tokensPage.load(event())) as { tokens: unknown[] };
		expect(after.tokens).toMatchObject([{ name: 'CI', status: 'revoked' }]);
		expect(await verifyToken(services.db, made.created.token)).toBeUndefined();
	});
});
