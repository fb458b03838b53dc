import { formAction, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { createToken, listTokens, revokeToken } from '$lib/server/tokens/tokens';
import { revokeFormSchema, tokenFormSchema } from './token-form';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load = (async (event) => {
	const { workspace, user, role } = await requireRole(event, 'viewer');
	const tokens = await listTokens(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: user.id
	});
	return { tokens, role, origin: event.url.origin };
}) satisfies PageServerLoad;

// Form actions need a signed-in person: the guard refuses access tokens here, so a token can never
// make or revoke tokens.
export const actions = {
	create: formAction('create', async (event: RequestEvent, form) => {
		const { workspace, user } = await requireRole(event, 'viewer');
		const input = readForm(form, tokenFormSchema, {
			name: 'text',
			role: 'text',
			expiresInDays: 'text'
		});
		const { token, view } = await createToken(event.locals.services.db, {
			workspaceId: workspace.id,
			userId: user.id,
			...input
		});
		return {
			message: `Token ${view.name} made.`,
			created: { id: view.id, name: view.name, token }
		};
	}),

	revoke: formAction('revoke', async (event: RequestEvent, form) => {
		const { workspace, user } = await requireRole(event, 'viewer');
		const { id } = readForm(form, revokeFormSchema, { id: 'text' });
		const view = await revokeToken(event.locals.services.db, {
			workspaceId: workspace.id,
			userId: user.id,
			id
		});
		return { message: `Token ${view.name} revoked.`, revoked: { name: view.name } };
	})
} satisfies Actions;
