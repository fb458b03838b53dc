import { workspaceInputSchema } from '$lib/api/workspaces';
import { formAction, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { renameWorkspace } from '$lib/server/workspaces/workspaces';
import type { Actions, RequestEvent } from './$types';

export const actions = {
	// The slug stays, so links people already shared keep working.
	rename: formAction('rename', async (event: RequestEvent, form) => {
		const { user, workspace } = await requireRole(event, 'owner');
		const { name } = readForm(form, workspaceInputSchema, { name: 'text' });
		await renameWorkspace(event.locals.services.db, {
			workspaceId: workspace.id,
			name,
			actorId: user.id
		});
		return { message: `The workspace is now called ${name}.` };
	})
} satisfies Actions;
