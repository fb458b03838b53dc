import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { fieldErrorsOf, Problem } from '$lib/server/problem';
import { createToken, listTokens, revokeToken } from '$lib/server/tokens/tokens';
import { revokeFormSchema, tokenFormSchema } from './token-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { workspace, user, role } = await requireRole(event, 'viewer');
	const tokens = await listTokens(event.locals.services.db, {
		workspaceId: workspace.id,
		userId: user.id
	});
	return { tokens, role, origin: event.url.origin };
}) satisfies PageServerLoad;

/** A refusal of the domain as the form's errors: on the field it names, else on the form. */
function refused(problem: Problem, values: Record<string, string>) {
	const errors: Record<string, string[]> = {};
	for (const issue of problem.issues ?? []) (errors[issue.path] ??= []).push(issue.message);
	if (!problem.issues?.length) errors.form = [problem.message];
	return fail(problem.status, { errors, values });
}

// Form actions need a signed-in person: the guard refuses access tokens here, so a token can never
// make or revoke tokens.
export const actions = {
	create: async (event) => {
		const { workspace, user } = await requireRole(event, 'viewer');
		const form = await event.request.formData();
		const values = {
			name: String(form.get('name') ?? ''),
			role: String(form.get('role') ?? ''),
			expiresInDays: String(form.get('expiresInDays') ?? '')
		};
		const parsed = tokenFormSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldErrorsOf(parsed.error), values });
		try {
			const { token, view } = await createToken(event.locals.services.db, {
				workspaceId: workspace.id,
				userId: user.id,
				...parsed.data
			});
			return { created: { id: view.id, name: view.name, token } };
		} catch (thrown) {
			if (thrown instanceof Problem) return refused(thrown, values);
			throw thrown;
		}
	},

	revoke: async (event) => {
		const { workspace, user } = await requireRole(event, 'viewer');
		const form = await event.request.formData();
		const values = { id: String(form.get('id') ?? '') };
		const parsed = revokeFormSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldErrorsOf(parsed.error), values });
		try {
			const view = await revokeToken(event.locals.services.db, {
				workspaceId: workspace.id,
				userId: user.id,
				id: parsed.data.id
			});
			return { revoked: { name: view.name } };
		} catch (thrown) {
			if (thrown instanceof Problem) return refused(thrown, values);
			throw thrown;
		}
	}
} satisfies Actions;
