import { json } from '@sveltejs/kit';
import { roleChangeSchema, type MemberResponse } from '$lib/api/workspaces';
import { apiRoute, noContent, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { changeMemberRole, removeMember } from '$lib/server/workspaces/members';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	const { role } = await readJsonBody(event.request, roleChangeSchema);
	const { member } = await changeMemberRole(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: event.params.userId,
		role,
		actorId: user.id
	});
	return json({ member } satisfies MemberResponse);
});

// Owners remove anyone; every member may remove themself (leave).
export const DELETE: RequestHandler = apiRoute(async (event) => {
	const leaving = event.locals.user?.id === event.params.userId;
	const { user, workspace } = await requireRole(event, leaving ? 'viewer' : 'owner');
	await removeMember(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: event.params.userId,
		actorId: user.id
	});
	return noContent();
});
