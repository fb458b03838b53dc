import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { listPendingInvitations } from '$lib/server/db/invitations';
import { listMembers } from '$lib/server/db/members';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { user, workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return json({
		members: await listMembers(db, workspace.id),
		// Who was invited is the owners' business only.
		invitations: role === 'owner' ? await listPendingInvitations(db, workspace.id) : [],
		myRole: role,
		myUserId: user.id
	});
});
