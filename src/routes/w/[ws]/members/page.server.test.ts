// The members page's load and form actions against a fresh database (the same domain functions as
// the JSON routes, so these check the form side: fields, refusals shown per field, undo, the guard).
import { describe, expect, it } from 'vitest';
import { listMembers } from '$lib/server/workspaces/members';
import { createTeamServices, outcome, pageEvents } from '$lib/server/test-support';
import { actions, load } from './+page.server';

async function world() {
	const team = await createTeamServices('Members page team', { editor: 'Edda' });
	const event = pageEvents(team.services, '/w/[ws]/members', { ws: team.workspace.slug });
	const roles = async () =>
		Object.fromEntries(
			(await listMembers(team.db, team.workspace.id)).map((m) => [m.email, m.role])
		);
	return { ...team, event, roles };
}

describe('members page load', () => {
	it('gives members for everyone and pending invitations for owners only', async () => {
		const w = await world();
		await actions.invite(w.event(w.users.owner, { email: 'new@example.test', role: 'editor' }));
		const asOwner = (await load(w.event(w.users.owner))) as {
			members: unknown[];
			invitations: { email: string }[];
			myRole: string;
		};
		expect(asOwner.members).toHaveLength(3);
		expect(asOwner.invitations.map((i) => i.email)).toEqual(['new@example.test']);
		expect(asOwner.myRole).toBe('owner');
		const asViewer = (await load(w.event(w.users.viewer))) as { invitations: unknown[] };
		expect(asViewer.invitations).toEqual([]);
		expect(await outcome(() => load(w.event(w.users.outsider)))).toMatchObject({
			kind: 'error',
			status: 404
		});
	});
});

describe('members page actions', () => {
	it('refuses a bad address next to its field, keeping what was typed; a good one is e-mailed', async () => {
		const w = await world();
		const refused = await actions.invite(
			w.event(w.users.owner, { email: 'not-an-address', role: 'editor' })
		);
		expect(refused).toMatchObject({
			status: 400,
			data: {
				action: 'invite',
				ok: false,
				values: { email: 'not-an-address', role: 'editor' },
				errors: { email: ['Enter a valid e-mail address.'] }
			}
		});
		expect(w.services.outbox).toHaveLength(0);

		const sent = await actions.invite(
			w.event(w.users.owner, { email: ' New@Example.test ', role: 'viewer' })
		);
		expect(sent).toEqual({
			action: 'invite',
			ok: true,
			message: 'Invitation sent to new@example.test.'
		});
		expect(w.services.outbox.map((m) => m.to)).toEqual(['new@example.test']);
	});

	it('revokes an invitation by its id', async () => {
		const w = await world();
		await actions.invite(w.event(w.users.owner, { email: 'maybe@example.test', role: 'viewer' }));
		const { invitations } = (await load(w.event(w.users.owner))) as {
			invitations: { id: string }[];
		};
		expect(await actions.revoke(w.event(w.users.owner, { id: invitations[0].id }))).toMatchObject({
			ok: true,
			message: 'Invitation for maybe@example.test revoked.'
		});
		expect(
			((await load(w.event(w.users.owner))) as { invitations: unknown[] }).invitations
		).toEqual([]);
		expect(await actions.revoke(w.event(w.users.owner, { id: invitations[0].id }))).toMatchObject({
			status: 404,
			data: { action: 'revoke', ok: false }
		});
	});

	it('changes a role, answers the previous one for an undo, and the undo puts it back', async () => {
		const w = await world();
		const editorId = w.users.editor.id;
		const changed = await actions.role(
			w.event(w.users.owner, { userId: editorId, role: 'viewer' })
		);
		expect(changed).toEqual({
			action: 'role',
			ok: true,
			message: 'Edda is now Viewer (was Editor).',
			undo: { userId: editorId, role: 'editor', who: 'Edda' }
		});
		expect((await w.roles())['editor@example.test']).toBe('viewer');
		const undone = await actions.role(w.event(w.users.owner, { userId: editorId, role: 'editor' }));
		expect(undone).toMatchObject({ ok: true, undo: { role: 'viewer' } });
		expect((await w.roles())['editor@example.test']).toBe('editor');
	});

	it('keeps the last owner: the refusal names the member it was for', async () => {
		const w = await world();
		const ownerId = w.users.owner.id;
		expect(
			await actions.role(w.event(w.users.owner, { userId: ownerId, role: 'viewer' }))
		).toMatchObject({
			status: 409,
			data: {
				action: 'role',
				ok: false,
				message: expect.stringMatching(/last owner/),
				values: { userId: ownerId, role: 'viewer' }
			}
		});
		expect((await w.roles())['owner@example.test']).toBe('owner');
		expect(
			await actions.role(w.event(w.users.owner, { userId: ownerId, role: 'superuser' }))
		).toMatchObject({ status: 400, data: { errors: { role: [expect.any(String)] } } });
	});

	it('lets only owners change roles or remove others; anyone may leave', async () => {
		const w = await world();
		const ownerId = w.users.owner.id;
		expect(
			await outcome(() =>
				actions.role(w.event(w.users.editor, { userId: ownerId, role: 'viewer' }))
			)
		).toMatchObject({ kind: 'error', status: 403 });
		expect(
			await outcome(() => actions.remove(w.event(w.users.editor, { userId: ownerId })))
		).toMatchObject({ kind: 'error', status: 403 });
		expect(
			await outcome(() => actions.remove(w.event(w.users.outsider, { userId: ownerId })))
		).toMatchObject({ kind: 'error', status: 404 });

		expect(
			await outcome(() => actions.remove(w.event(w.users.viewer, { userId: w.users.viewer.id })))
		).toMatchObject({ kind: 'redirect', status: 303, location: '/' });
		expect(
			await actions.remove(w.event(w.users.owner, { userId: w.users.editor.id }))
		).toMatchObject({ ok: true, message: 'Edda was removed.' });
		expect(await w.roles()).toEqual({ 'owner@example.test': 'owner' });
	});
});
