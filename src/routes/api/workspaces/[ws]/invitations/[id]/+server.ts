import { apiRoute, noContent } from '$lib/server/api';
import { revokeInvitation } from '$lib/server/workspaces/invitations';
import { requireRole } from '$lib/server/guard';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	await revokeInvitation(event.locals.services.db, {
		workspaceId: workspace.id,
		id: event.params.id,
		actorId: user.id
	});
	return noContent();
});
