import { Auth, skipCSRFCheck } from '@auth/core';
import { SvelteKitAuth } from '@auth/sveltekit';
import { authPages, createAuthConfig } from './auth-config';
import type { Services } from './services';

export const { handle: authHandle, signOut } = SvelteKitAuth(async (event) =>
	createAuthConfig(event.locals.services)
);

/** Keeps redirects on this site: only a local path ("/…", not "//…") is accepted. */
export function safeCallbackUrl(value: unknown, fallback = '/'): string {
	return typeof value === 'string' &&
		value.startsWith('/') &&
		!value.startsWith('//') &&
		!value.startsWith('/\\')
		? value
		: fallback;
}

/**
 * Asks Auth.js to e-mail a sign-in link and returns where to send the browser next (the
 * check-your-inbox page, or the error page). Our form action has already validated the address.
 */
export async function requestSignInLink(
	services: Services,
	origin: string,
	email: string,
	callbackUrl: string
): Promise<string> {
	// SvelteKit's own origin check already protects this form post, as in @auth/sveltekit's signIn.
	// (The cast bridges two pinned copies of @auth/core: the adapter's and @auth/sveltekit's.)
	const config = { ...createAuthConfig(services), skipCSRFCheck } as unknown as Parameters<
		typeof Auth
	>[1];
	const request = new Request(`${origin}/auth/signin/nodemailer`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, callbackUrl })
	});
	const response = await Auth(request, config);
	const location = new URL(response.headers.get('location') ?? authPages.verifyRequest, origin);
	if (location.pathname === '/auth/verify-request') return authPages.verifyRequest;
	return location.origin === origin ? location.pathname + location.search : authPages.error;
}
