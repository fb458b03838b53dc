import { redirect } from '@sveltejs/kit';
import { workspaceInputSchema } from '$lib/api/workspaces';
import { formAction, readForm } from '$lib/server/forms';
import { requireUser } from '$lib/server/guard';
import { createWorkspace } from '$lib/server/workspaces/workspaces';
import type { Actions, RequestEvent } from './$types';

export const actions = {
	create: formAction('create', async (event: RequestEvent, form) => {
		const user = requireUser(event);
		const { name } = readForm(form, workspaceInputSchema, { name: 'text' });
		const workspace = await createWorkspace(event.locals.services.db, { name, ownerId: user.id });
		redirect(303, `/w/${workspace.slug}/maps`);
	})
} satisfies Actions;
