import { json } from '@sveltejs/kit';
import { invitationInputSchema, type InvitationResponse } from '$lib/api/workspaces';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { inviteByEmail } from '$lib/server/workspaces/invitations';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const access = await requireRole(event, 'owner');
	const { email, role } = await readJsonBody(event.request, invitationInputSchema);
	const answer = await inviteByEmail(event.locals.services, access, {
		email,
		role,
		origin: event.url.origin,
		clientAddress: event.getClientAddress()
	});
	return json(answer satisfies InvitationResponse, { status: 201 });
});
