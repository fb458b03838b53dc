import { fail, redirect } from '@sveltejs/kit';
import {
	acceptInvitation,
	findInvitationByToken,
	invitationProblem
} from '$lib/server/workspaces/invitations';
import { requireUser } from '$lib/server/guard';
import { Problem } from '$lib/server/problem';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params }) => {
	const found = await findInvitationByToken(locals.services.db, params.token);
	const problem = invitationProblem(found?.invitation);
	if (problem || !found)
		return { invitation: null, error: problem?.message ?? 'This invitation link is not valid.' };
	const { invitation, workspace } = found;
	return {
		invitation: {
			workspaceName: workspace.name,
			email: invitation.email,
			role: invitation.role,
			expiresAt: invitation.expires_at
		},
		error: null
	};
}) satisfies PageServerLoad;

export const actions = {
	accept: async (event) => {
		const user = requireUser(event);
		try {
			const { slug } = await acceptInvitation(event.locals.services.db, {
				token: event.params.token,
				user
			});
			redirect(303, `/w/${slug}/maps`);
		} catch (thrown) {
			// Expired, used or addressed to someone else: shown on the page as `form.error`.
			if (thrown instanceof Problem) return fail(thrown.status, { error: thrown.message });
			throw thrown;
		}
	}
} satisfies Actions;
