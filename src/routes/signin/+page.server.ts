import { fail, redirect } from '@sveltejs/kit';
import { requestSignInLink, safeCallbackUrl } from '$lib/server/auth';
import { takeMailAllowance } from '$lib/server/mail/limits';
import { fieldErrorsOf } from '$lib/server/problem';
import { emailSchema } from '$lib/api/workspaces';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

const signInFormSchema = z.object({ email: emailSchema });

export const load = (async ({ locals, url }) => {
	const callbackUrl = safeCallbackUrl(url.searchParams.get('callbackUrl'));
	if (locals.user) redirect(303, callbackUrl);
	return { callbackUrl };
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const form = await event.request.formData();
		const values = { email: String(form.get('email') ?? '') };
		const callbackUrl = safeCallbackUrl(
			form.get('callbackUrl') ?? event.url.searchParams.get('callbackUrl')
		);
		const parsed = signInFormSchema.safeParse(values);
		if (!parsed.success) {
			// The typed value comes back for the form, clipped to an address's longest length (RFC 5321
			// via the schema's 254), so a huge post is never echoed whole.
			return fail(400, {
				errors: fieldErrorsOf(parsed.error) as { email?: string[] },
				values: { email: values.email.slice(0, 254) }
			});
		}
		// One client address may ask for only so many links an hour, whatever addresses it names.
		const wait = await takeMailAllowance([
			[event.locals.services.mailLimits.signInByClient, event.getClientAddress()]
		]);
		if (wait !== null) {
			return fail(429, {
				errors: {
					email: [
						`Too many sign-in requests from your network in the last hour; try again in about ${wait} minute${wait === 1 ? '' : 's'}.`
					]
				},
				values: { email: parsed.data.email }
			});
		}
		const next = await requestSignInLink(
			event.locals.services,
			event.url.origin,
			parsed.data.email,
			callbackUrl
		);
		redirect(303, next);
	}
} satisfies Actions;
