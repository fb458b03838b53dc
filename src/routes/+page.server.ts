import { fail, redirect } from '@sveltejs/kit';
import { createWorkspace } from '$lib/server/workspaces/workspaces';
import { requireUser } from '$lib/server/guard';
import { fieldErrorsOf } from '$lib/server/problem';
import { workspaceInputSchema } from '$lib/api/workspaces';
import type { Actions } from './$types';

export const actions = {
	create: async (event) => {
		const user = requireUser(event);
		const form = await event.request.formData();
		const values = { name: String(form.get('name') ?? '') };
		const parsed = workspaceInputSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, { errors: fieldErrorsOf(parsed.error) as { name?: string[] }, values });
		}
		const workspace = await createWorkspace(event.locals.services.db, {
			name: parsed.data.name,
			ownerId: user.id
		});
		redirect(303, `/w/${workspace.slug}/maps`);
	}
} satisfies Actions;
