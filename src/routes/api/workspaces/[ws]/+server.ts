import { json } from '@sveltejs/kit';
import { apiRoute, noContent, readJsonBody } from '$lib/server/api';
import { deleteWorkspace, renameWorkspace } from '$lib/server/db/workspaces';
import { requireRole } from '$lib/server/guard';
import { workspaceInputSchema } from '$lib/server/schemas';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	const { name } = await readJsonBody(event.request, workspaceInputSchema);
	const renamed = await renameWorkspace(event.locals.services.db, {
		workspaceId: workspace.id,
		name,
		actorId: user.id
	});
	return json({ workspace: { id: renamed.id, slug: renamed.slug, name: renamed.name } });
});

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	await deleteWorkspace(event.locals.services.db, { workspaceId: workspace.id, actorId: user.id });
	return noContent();
});
