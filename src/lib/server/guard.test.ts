import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as workspaceRoute from '../../routes/api/workspaces/[ws]/+server';
import * as invitationRoute from '../../routes/api/workspaces/[ws]/invitations/[id]/+server';
import * as invitationsRoute from '../../routes/api/workspaces/[ws]/invitations/+server';
import * as memberRoute from '../../routes/api/workspaces/[ws]/members/[userId]/+server';
import * as membersRoute from '../../routes/api/workspaces/[ws]/members/+server';
import * as workspaceLayout from '../../routes/w/[ws]/+layout.server';
import { createInvitation } from './workspaces/invitations';
import { createWorkspace } from './workspaces/workspaces';
import type { SessionUser } from './guard';
import type { Role } from '../roles';
import {
	addMember,
	countRows,
	createTestServices,
	createUser,
	makeEvent,
	outcome,
	type TestServices
} from './test-support';

type Actor = Role | 'outsider' | 'signed-out';

interface World {
	services: TestServices;
	slug: string;
	users: Record<Role | 'outsider' | 'target', SessionUser>;
	invitationId: string;
}

// A workspace with one member of each role, plus a viewer to act upon and a pending invitation.
async function buildWorld(): Promise<World> {
	const services = await createTestServices();
	const { db } = services;
	const users = {
		owner: await createUser(db, 'owner@example.test', 'Owner'),
		editor: await createUser(db, 'editor@example.test'),
		viewer: await createUser(db, 'viewer@example.test'),
		target: await createUser(db, 'target@example.test'),
		outsider: await createUser(db, 'outsider@example.test')
	};
	const ws = await createWorkspace(db, { name: 'Guard test team', ownerId: users.owner.id });
	for (const [key, role] of [
		['editor', 'editor'],
		['viewer', 'viewer'],
		['target', 'viewer']
	] as const) {
		await addMember(db, ws.id, users[key].id, role);
	}
	const { invitation } = await createInvitation(db, {
		workspaceId: ws.id,
		email: 'pending@example.test',
		role: 'viewer',
		invitedBy: users.owner.id,
		maxAgeMs: 60_000
	});
	return { services, slug: ws.slug, users, invitationId: invitation.id };
}

type Handler = (event: RequestEvent) => Promise<Response>;

interface ApiCase {
	name: string;
	minimum: Role;
	successStatus: number;
	routeId: string;
	method: string;
	handler: Handler;
	params: (w: World) => Record<string, string>;
	body?: unknown;
}

const apiCases: ApiCase[] = [
	{
		name: 'list members',
		minimum: 'viewer',
		successStatus: 200,
		routeId: '/api/workspaces/[ws]/members',
		method: 'GET',
		handler: membersRoute.GET as Handler,
		params: (w) => ({ ws: w.slug })
	},
	{
		name: 'invite',
		minimum: 'owner',
		successStatus: 201,
		routeId: '/api/workspaces/[ws]/invitations',
		method: 'POST',
		handler: invitationsRoute.POST as Handler,
		params: (w) => ({ ws: w.slug }),
		body: { email: 'new@example.test', role: 'editor' }
	},
	{
		name: 'revoke invitation',
		minimum: 'owner',
		successStatus: 204,
		routeId: '/api/workspaces/[ws]/invitations/[id]',
		method: 'DELETE',
		handler: invitationRoute.DELETE as Handler,
		params: (w) => ({ ws: w.slug, id: w.invitationId })
	},
	{
		name: 'change a role',
		minimum: 'owner',
		successStatus: 200,
		routeId: '/api/workspaces/[ws]/members/[userId]',
		method: 'PATCH',
		handler: memberRoute.PATCH as Handler,
		params: (w) => ({ ws: w.slug, userId: w.users.target.id }),
		body: { role: 'editor' }
	},
	{
		name: 'remove a member',
		minimum: 'owner',
		successStatus: 204,
		routeId: '/api/workspaces/[ws]/members/[userId]',
		method: 'DELETE',
		handler: memberRoute.DELETE as Handler,
		params: (w) => ({ ws: w.slug, userId: w.users.target.id })
	},
	{
		name: 'rename workspace',
		minimum: 'owner',
		successStatus: 200,
		routeId: '/api/workspaces/[ws]',
		method: 'PATCH',
		handler: workspaceRoute.PATCH as Handler,
		params: (w) => ({ ws: w.slug }),
		body: { name: 'Renamed team' }
	},
	{
		name: 'delete workspace',
		minimum: 'owner',
		successStatus: 204,
		routeId: '/api/workspaces/[ws]',
		method: 'DELETE',
		handler: workspaceRoute.DELETE as Handler,
		params: (w) => ({ ws: w.slug })
	}
];

const rank: Record<Role, number> = { viewer: 1, editor: 2, owner: 3 };
const actors: Actor[] = ['owner', 'editor', 'viewer', 'outsider', 'signed-out'];

function expectedStatus(actor: Actor, c: ApiCase): number {
	if (actor === 'signed-out') return 401;
	if (actor === 'outsider') return 404;
	return rank[actor] >= rank[c.minimum] ? c.successStatus : 403;
}

const matrix = apiCases.flatMap((c) =>
	actors.map((actor) => ({ ...c, actor, expected: expectedStatus(actor, c) }))
);

describe('role guard on every JSON API route', () => {
	it.each(matrix)('$name as $actor → $expected', async (c) => {
		const w = await buildWorld();
		const auditBefore = await countRows(w.services.db, 'audit_log');
		const user = c.actor === 'signed-out' ? null : w.users[c.actor];
		const response = await c.handler(
			makeEvent({
				services: w.services,
				user,
				routeId: c.routeId,
				params: c.params(w),
				method: c.method,
				body: c.body
			})
		);
		expect(response.status).toBe(c.expected);
		const auditAfter = await countRows(w.services.db, 'audit_log');
		if (c.expected >= 400) {
			// Refused: a bare error message (no workspace data) and nothing changed.
			const body = (await response.json()) as Record<string, unknown>;
			expect(Object.keys(body)).toEqual(['error']);
			expect(auditAfter).toBe(auditBefore);
			expect(w.services.outbox).toEqual([]);
		} else if (c.method !== 'GET') {
			expect(auditAfter).toBe(auditBefore + 1);
		}
	});

	it('lets any member leave (remove themself), but not remove someone else below owner', async () => {
		const w = await buildWorld();
		const leave = await memberRoute.DELETE(
			makeEvent({
				services: w.services,
				user: w.users.viewer,
				routeId: '/api/workspaces/[ws]/members/[userId]',
				params: { ws: w.slug, userId: w.users.viewer.id },
				method: 'DELETE'
			})
		);
		expect(leave.status).toBe(204);
		const removeOther = await memberRoute.DELETE(
			makeEvent({
				services: w.services,
				user: w.users.editor,
				routeId: '/api/workspaces/[ws]/members/[userId]',
				params: { ws: w.slug, userId: w.users.target.id },
				method: 'DELETE'
			})
		);
		expect(removeOther.status).toBe(403);
	});

	it('shows pending invitations to owners only', async () => {
		const w = await buildWorld();
		const list = async (user: SessionUser) =>
			(await (
				await membersRoute.GET(
					makeEvent({
						services: w.services,
						user,
						routeId: '/api/workspaces/[ws]/members',
						params: { ws: w.slug }
					})
				)
			).json()) as { invitations: unknown[]; members: unknown[]; myRole: Role };
		const asOwner = await list(w.users.owner);
		const asEditor = await list(w.users.editor);
		expect(asOwner.invitations).toHaveLength(1);
		expect(asEditor.invitations).toEqual([]);
		expect(asEditor.members).toHaveLength(4);
		expect(asEditor.myRole).toBe('editor');
	});
});

describe('role guard on the workspace pages (layout load)', () => {
	const expectations: [Actor, string][] = [
		['owner', 'value'],
		['editor', 'value'],
		['viewer', 'value'],
		['outsider', 'error 404'],
		['signed-out', 'redirect 303']
	];
	it.each(expectations)('%s → %s', async (actor, expected) => {
		const w = await buildWorld();
		const user = actor === 'signed-out' ? null : w.users[actor];
		const event = makeEvent<Parameters<typeof workspaceLayout.load>[0]>({
			services: w.services,
			user,
			routeId: '/w/[ws]',
			params: { ws: w.slug },
			path: `/w/${w.slug}/maps`
		});
		const result = await outcome(() => workspaceLayout.load(event));
		if (result.kind === 'value') {
			expect(expected).toBe('value');
			expect(result.value).toMatchObject({ workspace: { slug: w.slug }, role: actor });
		} else if (result.kind === 'redirect') {
			expect(`redirect ${result.status}`).toBe(expected);
			expect(result.location).toBe(
				`/signin?callbackUrl=${encodeURIComponent(`/w/${w.slug}/maps`)}`
			);
		} else {
			expect(`error ${result.status}`).toBe(expected);
			expect(result.message).toBe('Workspace not found.');
		}
	});

	it('gives the same 404 for a workspace that does not exist', async () => {
		const w = await buildWorld();
		const event = makeEvent<Parameters<typeof workspaceLayout.load>[0]>({
			services: w.services,
			user: w.users.owner,
			routeId: '/w/[ws]',
			params: { ws: 'no-such-team' }
		});
		expect(await outcome(() => workspaceLayout.load(event))).toEqual({
			kind: 'error',
			status: 404,
			message: 'Workspace not found.'
		});
	});
});
