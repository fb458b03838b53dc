import { Auth, raw, skipCSRFCheck } from '@auth/core';
import { SvelteKitAuth } from '@auth/sveltekit';
import type { Handle, RequestEvent } from '@sveltejs/kit';
import { authPages, createAuthConfig } from './auth-config';
import type { Services } from './services';

const { handle: authJsHandle } = SvelteKitAuth(async (event) =>
	createAuthConfig(event.locals.services)
);

/**
 * Auth.js under /auth, except its sign-in posts: sign-in links are asked for only through our
 * /signin form, which checks the address and the per-client limit (mail/limits.ts) first.
 */
export const authHandle: Handle = async (input) => {
	const { request, url } = input.event;
	if (request.method === 'POST' && url.pathname.startsWith('/auth/signin'))
		return new Response('Not found', { status: 404 });
	return authJsHandle(input);
};

/** Any origin will do: only whether a path stays on it matters. */
const PROBE_ORIGIN = 'http://framewright.invalid';
/** C0 and C1 control characters, DEL and backslashes, which browsers drop or read as "/". */
// eslint-disable-next-line no-control-regex -- control characters are what this refuses
const UNSAFE_CHARACTER = /[\u0000-\u001f\u007f-\u009f\\]/;
/** A local path: "/" not followed by another "/" (which would start a protocol-relative URL). */
const isLocalPath = (text: string) => text.startsWith('/') && !text.startsWith('//');

/**
 * Keeps redirects on this site: only a path on our own origin survives ("/…", never "//…"),
 * returned in its normalised form. The value and every percent-decoded form of it must be free of
 * control characters and backslashes, which browsers strip or turn into "/" and so would turn
 * "/<TAB>/evil.example" into "//evil.example"; anything else gives `fallback`.
 */
export function safeCallbackUrl(value: unknown, fallback = '/'): string {
	if (typeof value !== 'string' || value.length > 2048) return fallback;
	let text = value;
	for (let round = 0; round < 4; round++) {
		if (UNSAFE_CHARACTER.test(text) || !isLocalPath(text)) return fallback;
		let decoded: string;
		try {
			decoded = decodeURIComponent(text);
		} catch {
			return fallback; // a stray "%" is not a path we wrote
		}
		if (decoded === text) break;
		text = decoded;
	}
	const url = new URL(value, PROBE_ORIGIN);
	const path = url.pathname + url.search + url.hash;
	// Dot segments can collapse into "//" ("/.//evil.example"), so the result is checked again.
	return url.origin === PROBE_ORIGIN && isLocalPath(path) ? path : fallback;
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

/**
 * Ends the session the request's cookie names: Auth.js deletes it from the database and the
 * cleared cookie is set on the response. Needs no request body (our sign-out form has none to
 * speak of), unlike @auth/sveltekit's `signOut`, which reads one and fails without it.
 */
export async function endSession(event: RequestEvent): Promise<void> {
	const { services } = event.locals;
	// Our own sign-out form is protected by SvelteKit's origin check, as requestSignInLink's post is.
	const config = { ...createAuthConfig(services), skipCSRFCheck, raw } as unknown as Parameters<
		typeof Auth
	>[1] & { raw: typeof raw };
	const request = new Request(`${event.url.origin}/auth/signout`, {
		method: 'POST',
		headers: {
			cookie: event.request.headers.get('cookie') ?? '',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams({ callbackUrl: '/' })
	});
	const result = await Auth(request, config);
	for (const cookie of result.cookies ?? [])
		event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.options });
}
