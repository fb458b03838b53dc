import { json } from '@sveltejs/kit';
import { workspaceInputSchema, type RenamedWorkspaceResponse } from '$lib/api/workspaces';
import { apiRoute, noContent, readJsonBody } from '$lib/server/api';
import { deleteWorkspaceCaptures } from '$lib/server/captures/remove';
import { requireRole } from '$lib/server/guard';
import { deleteWorkspace, renameWorkspace } from '$lib/server/workspaces/workspaces';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	const { name } = await readJsonBody(event.request, workspaceInputSchema);
	const renamed = await renameWorkspace(event.locals.services.db, {
		workspaceId: workspace.id,
		name,
		actorId: user.id
	});
	return json({ workspace: renamed } satisfies RenamedWorkspaceResponse);
});

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	await deleteWorkspace(event.locals.services.db, { workspaceId: workspace.id, actorId: user.id });
	// Its captures' objects in storage go too (uploads, stores, decodes).
	await deleteWorkspaceCaptures(event.locals.services, workspace.id);
	return noContent();
});
