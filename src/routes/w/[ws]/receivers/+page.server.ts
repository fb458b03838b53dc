import { fail, redirect } from '@sveltejs/kit';
import { createProfileInputSchema } from '$lib/api/receivers';
import { requireRole } from '$lib/server/guard';
import { fieldErrors } from '$lib/server/forms';
import { issuesOf, Problem } from '$lib/server/problem';
import { createProfile, listProfiles } from '$lib/server/receivers/profiles';
import { saveWorkspaceSynonyms, workspaceSynonymsText } from '$lib/server/receivers/synonyms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return {
		profiles: await listProfiles(db, workspace.id),
		synonyms: await workspaceSynonymsText(db, workspace.id),
		role
	};
}) satisfies PageServerLoad;

/** The new profile's page, or the problems of the request as the form shows them. */
async function create(
	event: Parameters<Actions[string]>[0],
	form: 'blank' | 'import',
	request: unknown
) {
	const { user, workspace } = await requireRole(event, 'editor');
	const parsed = createProfileInputSchema.safeParse(request);
	if (!parsed.success) {
		return fail(400, { form, errors: fieldErrors(issuesOf(parsed.error)).errors, issues: [] });
	}
	try {
		const { profile } = await createProfile(event.locals.services.db, {
			workspaceId: workspace.id,
			actorId: user.id,
			request: parsed.data
		});
		redirect(303, `/w/${workspace.slug}/receivers/${profile.id}`);
	} catch (thrown) {
		if (!(thrown instanceof Problem)) throw thrown;
		return fail(thrown.status, {
			form,
			errors: { form: [thrown.message] },
			issues: thrown.issues ?? []
		});
	}
}

export const actions = {
	create: async (event) => {
		const data = await event.request.formData();
		return create(event, 'blank', {
			name: String(data.get('name') ?? ''),
			kind: String(data.get('kind') ?? 'display')
		});
	},
	/** A `framewright-profile@1` file from a multipart form: refused whole when it has problems. */
	import: async (event) => {
		const data = await event.request.formData();
		const file = data.get('file');
		if (!(file instanceof File) || file.size === 0)
			return fail(400, {
				form: 'import' as const,
				errors: { file: ['Choose a profile file (framewright-profile@1 JSON).'] },
				issues: []
			});
		return create(event, 'import', { profileJson: await file.text() });
	},
	synonyms: async (event) => {
		const { user, workspace } = await requireRole(event, 'editor');
		const text = String((await event.request.formData()).get('synonyms') ?? '');
		try {
			await saveWorkspaceSynonyms(event.locals.services.db, {
				workspaceId: workspace.id,
				actorId: user.id,
				text
			});
			return { form: 'synonyms' as const, saved: true };
		} catch (thrown) {
			if (!(thrown instanceof Problem)) throw thrown;
			return fail(thrown.status, {
				form: 'synonyms' as const,
				errors: { synonyms: [thrown.message] },
				issues: thrown.issues ?? [],
				text
			});
		}
	}
} satisfies Actions;
