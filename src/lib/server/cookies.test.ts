// Issue 10, finding 13 (the unit half; the browser half is tests/e2e/cookies.e2e.ts): the session
// cookie's Secure flag and its `__Secure-` name prefix follow ORIGIN's scheme, not each request.
// Cookie prefixes: RFC 6265bis §4.1.3 (from memory): a `__Secure-` cookie must be set with Secure
// from a secure origin, so browsers drop it, as any Secure cookie, over plain http.
import { Auth, skipCSRFCheck } from '@auth/core';
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { requestSignInLink } from './auth';
import { createAuthConfig } from './auth-config';
import { extractLinks } from './mail/mailbox';
import { pinCookieSecurity } from './http/cookies';
import { createTestServices, makeEvent } from './test-support';

/** Follows the sign-in link; `scheme` rewrites the URL the request arrives with (a proxy's view). */
async function signInCookies(
	origin: string,
	{ headers = {}, scheme }: { headers?: Record<string, string>; scheme?: 'http:' | 'https:' } = {}
) {
	const services = await createTestServices({ ORIGIN: origin });
	await requestSignInLink(services, origin, 'crew@example.test', '/');
	const link = new URL(extractLinks(services.outbox[0].text)[0]);
	if (scheme) link.protocol = scheme;
	const config = { ...createAuthConfig(services), skipCSRFCheck } as unknown as Parameters<
		typeof Auth
	>[1];
	const response = await Auth(new Request(link, { headers }), config);
	return response.headers.getSetCookie().filter((c) => /session-token=/.test(c));
}

describe('session cookies follow ORIGIN', () => {
	it('https ORIGIN: a Secure cookie with the __Secure- prefix, also when TLS ends at a proxy', async () => {
		for (const scheme of ['https:', 'http:'] as const) {
			const [cookie] = await signInCookies('https://framewright.example.test', { scheme });
			expect(cookie).toMatch(/^__Secure-authjs\.session-token=/);
			expect(cookie).toMatch(/;\s*Secure/i);
			expect(cookie).toMatch(/;\s*HttpOnly/i);
		}
	});

	it('http ORIGIN: a plain cookie, even when a proxy header claims https', async () => {
		const [plain] = await signInCookies('http://framewright.test:3000');
		expect(plain).toMatch(/^authjs\.session-token=/);
		expect(plain).not.toMatch(/;\s*Secure/i);
		const [proxied] = await signInCookies('http://framewright.test:3000', {
			headers: { 'x-forwarded-proto': 'https' },
			scheme: 'https:'
		});
		expect(proxied).toMatch(/^authjs\.session-token=/);
		expect(proxied).not.toMatch(/;\s*Secure/i);
	});
});

describe('every cookie the server sets follows ORIGIN (the session refresh re-sets it each request)', () => {
	it.each([
		['http://framewright.test:3000', false],
		['https://framewright.example.test', true]
	])('ORIGIN %s → Secure %s, whatever the caller asked', async (origin, secure) => {
		const services = await createTestServices({ ORIGIN: origin });
		const event = makeEvent<RequestEvent>({ services, user: null, routeId: '/' });
		const calls: [string, Parameters<RequestEvent['cookies']['set']>[2]][] = [];
		event.cookies.set = (name, _value, options) => void calls.push([name, options]);
		event.cookies.delete = (name, options) => void calls.push([name, options]);
		await pinCookieSecurity({
			event,
			resolve: async (e) => {
				// What @auth/sveltekit does with a Set-Cookie that lacks Secure: no `secure` option at all.
				e.cookies.set('authjs.session-token', 't', { path: '/', httpOnly: true });
				e.cookies.set('other', 'x', { path: '/', secure: !secure });
				e.cookies.delete('gone', { path: '/' });
				return new Response('ok');
			}
		});
		expect(calls.map(([name, options]) => [name, options.secure])).toEqual([
			['authjs.session-token', secure],
			['other', secure],
			['gone', secure]
		]);
	});
});
