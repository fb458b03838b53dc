import { describe, expect, it } from 'vitest';
import * as invitePage from '../../../routes/invite/[token]/+page.server';
import * as invitationsRoute from '../../../routes/api/workspaces/[ws]/invitations/+server';
import { extractLinks } from '../mail/mailbox';
import { countRows, createTestServices, createUser, makeEvent, outcome } from '../test-support';
import { acceptInvitation, createInvitation, findInvitationByToken } from './invitations';
import { findMembership } from './members';
import { createWorkspace } from './workspaces';

const DAY = 24 * 60 * 60 * 1000;

async function setup() {
	const services = await createTestServices();
	const owner = await createUser(services.db, 'owner@example.test', 'Team owner');
	const guest = await createUser(services.db, 'guest@example.test');
	const workspace = await createWorkspace(services.db, {
		name: 'Invitation team',
		ownerId: owner.id
	});
	return { services, owner, guest, workspace };
}

describe('invitations', () => {
	it('are e-mailed with an accept link that expires in 7 days; accepting adds the member once', async () => {
		const { services, owner, guest, workspace } = await setup();
		const before = Date.now();
		const response = await invitationsRoute.POST(
			makeEvent({
				services,
				user: owner,
				routeId: '/api/workspaces/[ws]/invitations',
				params: { ws: workspace.slug },
				body: { email: 'Guest@Example.test', role: 'editor' }
			})
		);
		expect(response.status).toBe(201);
		const { invitation } = (await response.json()) as {
			invitation: { email: string; role: string; expiresAt: string };
		};
		expect(invitation).toMatchObject({
			email: 'guest@example.test',
			role: 'editor',
			invitedBy: 'owner@example.test'
		});
		const lifetime = Date.parse(invitation.expiresAt) - before;
		expect(lifetime).toBeGreaterThanOrEqual(7 * DAY);
		expect(lifetime).toBeLessThan(7 * DAY + 60_000);

		expect(services.outbox).toHaveLength(1);
		const [link] = extractLinks(services.outbox[0].text);
		expect(link).toMatch(/^http:\/\/localhost\/invite\/[\w-]{40,}$/);
		const token = new URL(link).pathname.split('/').pop()!;
		// The database holds only a hash of the token.
		expect(
			await services.db
				.selectFrom('invitations')
				.where('token_hash', '=', token)
				.selectAll()
				.execute()
		).toEqual([]);

		const load = (await invitePage.load(
			makeEvent({ services, user: guest, routeId: '/invite/[token]', params: { token } }) as never
		)) as {
			invitation: { workspaceName: string } | null;
			error: string | null;
		};
		expect(load).toMatchObject({
			invitation: { workspaceName: 'Invitation team', email: 'guest@example.test', role: 'editor' },
			error: null
		});

		const accept = () =>
			outcome(() =>
				invitePage.actions.accept(
					makeEvent({
						services,
						user: guest,
						routeId: '/invite/[token]',
						params: { token },
						method: 'POST',
						body: new FormData()
					}) as never
				)
			);
		expect(await accept()).toEqual({
			kind: 'redirect',
			status: 303,
			location: `/w/${workspace.slug}/maps`
		});
		expect((await findMembership(services.db, workspace.id, guest.id))?.role).toBe('editor');

		// A second use is refused and changes nothing.
		const second = await accept();
		expect(second).toMatchObject({
			kind: 'value',
			value: { status: 410, data: { error: 'This invitation has already been used.' } }
		});
		expect(await countRows(services.db, 'memberships')).toBe(2);
	});

	it('refuses an expired invitation', async () => {
		const { services, owner, guest, workspace } = await setup();
		const issued = new Date('2026-12-01T10:00:00Z');
		const { token } = await createInvitation(services.db, {
			workspaceId: workspace.id,
			email: guest.email,
			role: 'viewer',
			invitedBy: owner.id,
			maxAgeMs: 7 * DAY,
			now: issued
		});
		await expect(
			acceptInvitation(services.db, {
				token,
				user: guest,
				now: new Date(issued.getTime() + 7 * DAY)
			})
		).rejects.toMatchObject({
			status: 410,
			message: expect.stringMatching(/expired/)
		});
		expect(await findMembership(services.db, workspace.id, guest.id)).toBeUndefined();
		// One millisecond earlier it still works.
		await expect(
			acceptInvitation(services.db, {
				token,
				user: guest,
				now: new Date(issued.getTime() + 7 * DAY - 1)
			})
		).resolves.toEqual({ slug: workspace.slug });
	});

	it('shows an expired invitation as an error on the invitation page', async () => {
		const { services, owner, guest, workspace } = await setup();
		const { token } = await createInvitation(services.db, {
			workspaceId: workspace.id,
			email: guest.email,
			role: 'viewer',
			invitedBy: owner.id,
			maxAgeMs: 7 * DAY,
			now: new Date(Date.now() - 8 * DAY)
		});
		const data = await invitePage.load(
			makeEvent({ services, user: null, routeId: '/invite/[token]', params: { token } }) as never
		);
		expect(data).toEqual({
			invitation: null,
			error: 'This invitation has expired. Ask the workspace owner to send a new one.'
		});
	});

	it('must be accepted by the invited address', async () => {
		const { services, owner, workspace } = await setup();
		const stranger = await createUser(services.db, 'stranger@example.test');
		const { token } = await createInvitation(services.db, {
			workspaceId: workspace.id,
			email: 'guest@example.test',
			role: 'viewer',
			invitedBy: owner.id,
			maxAgeMs: DAY
		});
		await expect(acceptInvitation(services.db, { token, user: stranger })).rejects.toMatchObject({
			status: 403
		});
		const found = await findInvitationByToken(services.db, token);
		expect(found?.invitation.accepted_at).toBeNull();
	});

	it('refuses an unknown token without revealing anything', async () => {
		const { services, guest } = await setup();
		await expect(
			acceptInvitation(services.db, { token: 'made-up', user: guest })
		).rejects.toMatchObject({ status: 404 });
	});

	it('a new invitation to the same address replaces the pending one', async () => {
		const { services, owner, guest, workspace } = await setup();
		const first = await createInvitation(services.db, {
			workspaceId: workspace.id,
			email: guest.email,
			role: 'viewer',
			invitedBy: owner.id,
			maxAgeMs: DAY
		});
		await createInvitation(services.db, {
			workspaceId: workspace.id,
			email: guest.email,
			role: 'editor',
			invitedBy: owner.id,
			maxAgeMs: DAY
		});
		await expect(
			acceptInvitation(services.db, { token: first.token, user: guest })
		).rejects.toMatchObject({ status: 404 });
		expect(await countRows(services.db, 'invitations')).toBe(1);
	});

	it('refuses to invite someone who is already a member (409)', async () => {
		const { services, owner, workspace } = await setup();
		const response = await invitationsRoute.POST(
			makeEvent({
				services,
				user: owner,
				routeId: '/api/workspaces/[ws]/invitations',
				params: { ws: workspace.slug },
				body: { email: owner.email, role: 'viewer' }
			})
		);
		expect(response.status).toBe(409);
		expect(services.outbox).toEqual([]);
	});
});
