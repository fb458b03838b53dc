import { fail, redirect } from '@sveltejs/kit';
import { acceptInvitation, invitationPageView } from '$lib/server/workspaces/invitations';
import { requireUser } from '$lib/server/guard';
import { Problem } from '$lib/server/problem';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, params }) =>
	invitationPageView(locals.services.db, params.token)) satisfies PageServerLoad;

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
