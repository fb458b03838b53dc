import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as homePage from '../../routes/+page.server';
import * as workspacesRoute from '../../routes/api/workspaces/+server';
import * as workspaceRoute from '../../routes/api/workspaces/[ws]/+server';
import * as invitationsRoute from '../../routes/api/workspaces/[ws]/invitations/+server';
import * as memberRoute from '../../routes/api/workspaces/[ws]/members/[userId]/+server';
import { createWorkspace } from './workspaces/workspaces';
import { countRows, createTestServices, createUser, makeEvent } from './test-support';

type Handler = (event: RequestEvent) => Promise<Response>;
const tables = ['workspaces', 'memberships', 'invitations', 'audit_log'] as const;

async function setup() {
	const services = await createTestServices();
	const owner = await createUser(services.db, 'owner@example.test');
	const workspace = await createWorkspace(services.db, { name: 'Input team', ownerId: owner.id });
	const snapshot = async () => Promise.all(tables.map((t) => countRows(services.db, t)));
	return { services, owner, workspace, snapshot };
}

const cases: {
	name: string;
	handler: Handler;
	routeId: string;
	method: string;
	body: unknown;
	paths: string[];
}[] = [
	{
		name: 'empty workspace name',
		handler: workspacesRoute.POST as Handler,
		routeId: '/api/workspaces',
		method: 'POST',
		body: { name: ' ' },
		paths: ['name']
	},
	{
		name: 'missing workspace name',
		handler: workspacesRoute.POST as Handler,
		routeId: '/api/workspaces',
		method: 'POST',
		body: {},
		paths: ['name']
	},
	{
		name: 'unknown field',
		handler: workspacesRoute.POST as Handler,
		routeId: '/api/workspaces',
		method: 'POST',
		body: { name: 'Fine name', colour: 'red' },
		paths: ['(root)']
	},
	{
		name: 'body not JSON',
		handler: workspacesRoute.POST as Handler,
		routeId: '/api/workspaces',
		method: 'POST',
		body: '{name:',
		paths: ['(root)']
	},
	{
		name: 'rename too long',
		handler: workspaceRoute.PATCH as Handler,
		routeId: '/api/workspaces/[ws]',
		method: 'PATCH',
		body: { name: 'x'.repeat(81) },
		paths: ['name']
	},
	{
		name: 'invitation bad address and role',
		handler: invitationsRoute.POST as Handler,
		routeId: '/api/workspaces/[ws]/invitations',
		method: 'POST',
		body: { email: 'nobody', role: 'admin' },
		paths: ['email', 'role']
	},
	{
		name: 'role change to an unknown role',
		handler: memberRoute.PATCH as Handler,
		routeId: '/api/workspaces/[ws]/members/[userId]',
		method: 'PATCH',
		body: { role: 'superuser' },
		paths: ['role']
	}
];

describe('bad API input', () => {
	it.each(cases)('$name → 400 with field issues, database unchanged', async (c) => {
		const { services, owner, workspace, snapshot } = await setup();
		const before = await snapshot();
		const response = await c.handler(
			makeEvent({
				services,
				user: owner,
				routeId: c.routeId,
				params: { ws: workspace.slug, userId: owner.id },
				method: c.method,
				body: c.body
			})
		);
		expect(response.status).toBe(400);
		const body = (await response.json()) as {
			error: string;
			issues: { path: string; message: string }[];
		};
		expect(body.error).toBeTruthy();
		expect(body.issues.map((i) => i.path).sort()).toEqual(c.paths);
		expect(body.issues.every((i) => i.message.length > 0)).toBe(true);
		expect(await snapshot()).toEqual(before);
		expect(services.outbox).toEqual([]);
	});
});

describe('the create-workspace form action', () => {
	it('returns field errors and the typed values, creating nothing', async () => {
		const { services, owner, snapshot } = await setup();
		const before = await snapshot();
		const form = new FormData();
		form.set('name', 'x');
		const result = await homePage.actions.create(
			makeEvent({ services, user: owner, routeId: '/', body: form }) as never
		);
		expect(result).toMatchObject({
			status: 400,
			data: { errors: { name: ['Use at least 2 characters.'] }, values: { name: 'x' } }
		});
		expect(await snapshot()).toEqual(before);
	});

	it('creates the workspace with its creator as owner and a unique slug', async () => {
		const { services, owner } = await setup();
		const form = new FormData();
		form.set('name', 'Input Team!');
		const thrown = await homePage.actions
			.create(makeEvent({ services, user: owner, routeId: '/', body: form }) as never)
			.catch((e: unknown) => e);
		expect(thrown).toMatchObject({ status: 303, location: '/w/input-team-2/maps' });
		const created = await services.db
			.selectFrom('workspaces')
			.selectAll()
			.where('slug', '=', 'input-team-2')
			.executeTakeFirstOrThrow();
		expect(created.name).toBe('Input Team!');
	});
});
