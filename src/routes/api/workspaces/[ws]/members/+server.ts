import { json } from '@sveltejs/kit';
import type { MembersOverview } from '$lib/api/workspaces';
import { apiRoute } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { membersOverview } from '$lib/server/workspaces/members';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { user, workspace, role } = await requireRole(event, 'viewer');
	const overview = await membersOverview(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: user.id,
		role
	});
	return json(overview satisfies MembersOverview);
});
