import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { emailSchema } from '$lib/api/workspaces';
import { requestSignInLink, safeCallbackUrl } from '$lib/server/auth';
import { formAction, readForm } from '$lib/server/forms';
import { takeMailAllowance } from '$lib/server/mail/limits';
import { Problem } from '$lib/server/problem';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const signInFormSchema = z.object({ email: emailSchema });

export const load = (async ({ locals, url }) => {
	const callbackUrl = safeCallbackUrl(url.searchParams.get('callbackUrl'));
	if (locals.user) redirect(303, callbackUrl);
	return { callbackUrl };
}) satisfies PageServerLoad;

// A plain POST (no enhance): the action answers with a redirect to the "check your inbox" page.
// formAction echoes sent values cut to a safe length, so a huge post is never sent back whole.
export const actions = {
	default: formAction('signin', async (event: RequestEvent, form) => {
		const callbackUrl = safeCallbackUrl(
			form.get('callbackUrl') ?? event.url.searchParams.get('callbackUrl')
		);
		const { email } = readForm(form, signInFormSchema, { email: 'text' });
		// One client address may ask for only so many links an hour, whatever addresses it names.
		const wait = await takeMailAllowance([
			[event.locals.services.mailLimits.signInByClient, event.getClientAddress()]
		]);
		if (wait !== null) {
			const message = `Too many sign-in requests from your network in the last hour; try again in about ${wait} minute${wait === 1 ? '' : 's'}.`;
			throw new Problem(429, message, [{ path: 'email', message }]);
		}
		redirect(
			303,
			await requestSignInLink(event.locals.services, event.url.origin, email, callbackUrl)
		);
	})
} satisfies Actions;
