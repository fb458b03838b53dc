import { describe, expect, it } from 'vitest';
import * as memberRoute from '../../../routes/api/workspaces/[ws]/members/[userId]/+server';
import { addMember, countRows, createTestServices, createUser, makeEvent } from '../test-support';
import { changeMemberRole, findMembership, listMembers } from './members';
import { createWorkspace } from './workspaces';

async function setup() {
	const services = await createTestServices();
	const owner = await createUser(services.db, 'owner@example.test');
	const other = await createUser(services.db, 'other@example.test');
	const workspace = await createWorkspace(services.db, { name: 'Owners team', ownerId: owner.id });
	await addMember(services.db, workspace.id, other.id, 'editor');
	const route = '/api/workspaces/[ws]/members/[userId]';
	const call = (
		handler: typeof memberRoute.PATCH,
		actor: typeof owner,
		userId: string,
		body?: unknown
	) =>
		handler(
			makeEvent({
				services,
				user: actor,
				routeId: route,
				params: { ws: workspace.slug, userId },
				method: body ? 'PATCH' : 'DELETE',
				body
			})
		);
	return { services, owner, other, workspace, call };
}

describe('the last owner', () => {
	it('cannot be demoted (409) and nothing changes', async () => {
		const { services, owner, workspace, call } = await setup();
		const audit = await countRows(services.db, 'audit_log');
		const response = await call(memberRoute.PATCH, owner, owner.id, { role: 'editor' });
		expect(response.status).toBe(409);
		expect(((await response.json()) as { error: string }).error).toMatch(/last owner/);
		expect((await findMembership(services.db, workspace.id, owner.id))?.role).toBe('owner');
		expect(await countRows(services.db, 'audit_log')).toBe(audit);
	});

	it('cannot leave (409)', async () => {
		const { services, owner, workspace, call } = await setup();
		expect((await call(memberRoute.DELETE, owner, owner.id)).status).toBe(409);
		expect(await findMembership(services.db, workspace.id, owner.id)).toBeDefined();
	});

	it('can step down once someone else is an owner too', async () => {
		const { services, owner, other, workspace, call } = await setup();
		const promoted = await call(memberRoute.PATCH, owner, other.id, { role: 'owner' });
		expect(promoted.status).toBe(200);
		expect(await promoted.json()).toMatchObject({
			member: { userId: other.id, email: 'other@example.test', role: 'owner' }
		});
		expect((await call(memberRoute.PATCH, owner, owner.id, { role: 'viewer' })).status).toBe(200);
		const roles = Object.fromEntries(
			(await listMembers(services.db, workspace.id)).map((m) => [m.email, m.role])
		);
		expect(roles).toEqual({ 'owner@example.test': 'viewer', 'other@example.test': 'owner' });
		// And now the other owner is the last one.
		await expect(
			changeMemberRole(services.db, {
				workspaceId: workspace.id,
				userId: other.id,
				role: 'editor',
				actorId: other.id
			})
		).rejects.toMatchObject({ status: 409 });
	});

	it('records role changes in the audit log', async () => {
		const { services, owner, other, call } = await setup();
		await call(memberRoute.PATCH, owner, other.id, { role: 'viewer' });
		const entry = await services.db
			.selectFrom('audit_log')
			.selectAll()
			.orderBy('id', 'desc')
			.executeTakeFirstOrThrow();
		expect(entry).toMatchObject({
			action: 'member.role_change',
			actor_id: owner.id,
			target: other.id
		});
		expect(JSON.parse(entry.details)).toEqual({ from: 'editor', to: 'viewer' });
	});

	it('gives 404 for a user who is not a member', async () => {
		const { owner, call } = await setup();
		expect((await call(memberRoute.PATCH, owner, 'no-such-user', { role: 'viewer' })).status).toBe(
			404
		);
	});
});
