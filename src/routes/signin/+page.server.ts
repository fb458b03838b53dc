import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { emailSchema } from '$lib/api/workspaces';
import { requestSignInLink, safeCallbackUrl } from '$lib/server/auth';
import { formAction, readForm } from '$lib/server/forms';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const signInFormSchema = z.object({ email: emailSchema });

export const load = (async ({ locals, url }) => {
	const callbackUrl = safeCallbackUrl(url.searchParams.get('callbackUrl'));
	if (locals.user) redirect(303, callbackUrl);
	return { callbackUrl };
}) satisfies PageServerLoad;

// A plain POST (no enhance): the action answers with a redirect to the "check your inbox" page.
export const actions = {
	default: formAction('signin', async (event: RequestEvent, form) => {
		const callbackUrl = safeCallbackUrl(
			form.get('callbackUrl') ?? event.url.searchParams.get('callbackUrl')
		);
		const { email } = readForm(form, signInFormSchema, { email: 'text' });
		redirect(
			303,
			await requestSignInLink(event.locals.services, event.url.origin, email, callbackUrl)
		);
	})
} satisfies Actions;
