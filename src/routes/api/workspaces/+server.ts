import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { createWorkspace, listWorkspacesForUser } from '$lib/server/db/workspaces';
import { requireUser } from '$lib/server/guard';
import { workspaceInputSchema } from '$lib/server/schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const user = requireUser(event);
	return json({ workspaces: await listWorkspacesForUser(event.locals.services.db, user.id) });
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const user = requireUser(event);
	const { name } = await readJsonBody(event.request, workspaceInputSchema);
	const workspace = await createWorkspace(event.locals.services.db, { name, ownerId: user.id });
	return json(
		{ workspace: { id: workspace.id, slug: workspace.slug, name: workspace.name, role: 'owner' } },
		{ status: 201 }
	);
});
