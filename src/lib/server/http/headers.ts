/**
 * Security headers on every response (pages also get SvelteKit's Content-Security-Policy with
 * nonces and `frame-ancestors 'none'`, set in svelte.config.js):
 * - `X-Content-Type-Options: nosniff`: a download is never run as a script or page;
 * - `X-Frame-Options: DENY`: no framing, for browsers that predate `frame-ancestors`;
 * - `Referrer-Policy: same-origin`: share-link and invitation tokens in our URLs never reach
 *   another site in a Referer;
 * - `Strict-Transport-Security` (one year) when ORIGIN is https, so browsers stop trying http.
 */
import type { Handle } from '@sveltejs/kit';

export function securityHeaders(origin: string | null): Record<string, string> {
	const headers: Record<string, string> = {
		'x-content-type-options': 'nosniff',
		'x-frame-options': 'DENY',
		'referrer-policy': 'same-origin'
	};
	if (origin?.startsWith('https:')) headers['strict-transport-security'] = 'max-age=31536000';
	return headers;
}

export const addSecurityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const headers = securityHeaders(event.locals.services.config.origin);
	try {
		for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
		return response;
	} catch {
		// Some responses (a fetch() passed through, Response.redirect) have immutable headers.
		const copy = new Response(response.body, response);
		for (const [name, value] of Object.entries(headers)) copy.headers.set(name, value);
		return copy;
	}
};
