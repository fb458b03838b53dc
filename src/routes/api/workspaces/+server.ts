import { json } from '@sveltejs/kit';
import type { CreatedWorkspaceResponse, WorkspaceListResponse } from '$lib/api/workspaces';
import { workspaceInputSchema } from '$lib/api/workspaces';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireSessionUser, requireUser, tokenScope } from '$lib/server/guard';
import { createWorkspace, listWorkspacesForUser } from '$lib/server/workspaces/workspaces';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const user = requireUser(event);
	const workspaces = await listWorkspacesForUser(
		event.locals.services.db,
		user.id,
		tokenScope(event)
	);
	return json({ workspaces } satisfies WorkspaceListResponse);
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const user = requireSessionUser(event);
	const { name } = await readJsonBody(event.request, workspaceInputSchema);
	const workspace = await createWorkspace(event.locals.services.db, { name, ownerId: user.id });
	return json({ workspace } satisfies CreatedWorkspaceResponse, { status: 201 });
});
