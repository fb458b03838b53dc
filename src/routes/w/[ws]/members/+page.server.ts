import { redirect } from '@sveltejs/kit';
import {
	invitationInputSchema,
	invitationRefSchema,
	memberRefSchema,
	memberRoleFormSchema
} from '$lib/api/workspaces';
import { ROLE_LABELS } from '$lib/roles';
import { formAction, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { inviteByEmail, revokeInvitation } from '$lib/server/workspaces/invitations';
import { changeMemberRole, membersOverview, removeMember } from '$lib/server/workspaces/members';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const who = (person: { name: string | null; email: string }) => person.name ?? person.email;

// Members and (for owners) pending invitations, for the first paint; every form below reloads them.
export const load = (async (event) => {
	const { user, workspace, role } = await requireRole(event, 'viewer');
	return membersOverview(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: user.id,
		role
	});
}) satisfies PageServerLoad;

export const actions = {
	invite: formAction('invite', async (event: RequestEvent, form) => {
		const access = await requireRole(event, 'owner');
		const { email, role } = readForm(form, invitationInputSchema, { email: 'text', role: 'text' });
		await inviteByEmail(event.locals.services, access, {
			email,
			role,
			origin: event.url.origin,
			clientAddress: event.getClientAddress()
		});
		return { message: `Invitation sent to ${email}.` };
	}),

	revoke: formAction('revoke', async (event: RequestEvent, form) => {
		const { user, workspace } = await requireRole(event, 'owner');
		const { id } = readForm(form, invitationRefSchema, { id: 'text' });
		const { email } = await revokeInvitation(event.locals.services.db, {
			workspaceId: workspace.id,
			id,
			actorId: user.id
		});
		return { message: `Invitation for ${email} revoked.` };
	}),

	// The answer names the role the member had, so the page can offer to put it back (undo).
	role: formAction('role', async (event: RequestEvent, form) => {
		const { user, workspace } = await requireRole(event, 'owner');
		const { userId, role } = readForm(form, memberRoleFormSchema, { userId: 'text', role: 'text' });
		const { member, from } = await changeMemberRole(event.locals.services.db, {
			workspaceId: workspace.id,
			userId,
			role,
			actorId: user.id
		});
		return {
			message:
				from === role
					? `${who(member)} is already ${ROLE_LABELS[role]}.`
					: `${who(member)} is now ${ROLE_LABELS[role]} (was ${ROLE_LABELS[from]}).`,
			undo: from === role ? null : { userId, role: from, who: who(member) }
		};
	}),

	// Owners remove anyone; every member may remove themself (leave), which ends on the start page.
	remove: formAction('remove', async (event: RequestEvent, form) => {
		const { user, workspace } = await requireRole(event, 'viewer');
		const { userId } = readForm(form, memberRefSchema, { userId: 'text' });
		if (userId !== user.id) await requireRole(event, 'owner');
		const member = await removeMember(event.locals.services.db, {
			workspaceId: workspace.id,
			userId,
			actorId: user.id
		});
		if (userId === user.id) redirect(303, '/');
		return { message: `${who(member)} was removed.` };
	})
} satisfies Actions;
