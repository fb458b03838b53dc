import { fail, redirect } from '@sveltejs/kit';
import { relinkInputSchema, relinkQuerySchema } from '$lib/api/receivers';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { parseOrProblem, Problem } from '$lib/server/problem';
import { requireProfile } from '$lib/server/receivers/profiles';
import { applyRelink, relinkReview } from '$lib/server/receivers/relink';
import type { Actions, PageServerLoad } from './$types';

// The review of moving the draft's links to a newer map revision, for the first paint; the move is
// a form action (it works without JavaScript) on the same domain function as the JSON route.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => {
		const { to } = readQuery(event.url, relinkQuerySchema);
		const profile = await requireProfile(db, workspace.id, event.params.profileId);
		const review = await relinkReview(db, workspace.id, profile.id, to);
		return {
			review,
			profile: { id: profile.id, name: profile.name, version: profile.version },
			role
		};
	});
}) satisfies PageServerLoad;

export const actions = {
	move: async (event) => {
		const { user, workspace } = await requireRole(event, 'editor');
		const form = await event.request.formData();
		let revision: number;
		try {
			// The form's fields read through the JSON route's schema: one validation for both.
			const body = parseOrProblem(relinkInputSchema, {
				version: Number(form.get('version')),
				revision: Number(form.get('revision')),
				accept: form.getAll('accept').map(String)
			});
			({ revision } = await applyRelink(event.locals.services.db, {
				workspaceId: workspace.id,
				profileId: event.params.profileId,
				...body,
				actorId: user.id
			}));
		} catch (thrown) {
			if (!(thrown instanceof Problem)) throw thrown;
			return fail(thrown.status, { message: thrown.message, issues: thrown.issues ?? [] });
		}
		redirect(303, `/w/${workspace.slug}/receivers/${event.params.profileId}?relinked=${revision}`);
	}
} satisfies Actions;
