import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { createInvitation } from '$lib/server/db/invitations';
import { requireRole } from '$lib/server/guard';
import { invitationMail } from '$lib/server/mail/templates';
import { invitationInputSchema } from '$lib/server/schemas';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'owner');
	const { email, role } = await readJsonBody(event.request, invitationInputSchema);
	const { db, config, sendMail } = event.locals.services;
	const { invitation, token } = await createInvitation(db, {
		workspaceId: workspace.id,
		email,
		role,
		invitedBy: user.id,
		maxAgeMs: config.invitationMaxAgeMs
	});
	await sendMail(
		invitationMail({
			to: email,
			url: new URL(`/invite/${token}`, event.url.origin).toString(),
			workspaceName: workspace.name,
			role,
			invitedBy: user.name ?? user.email,
			expires: new Date(invitation.expiresAt)
		})
	);
	return json({ invitation }, { status: 201 });
});
