// Issue 10, finding 4: open redirect. `/signin?callbackUrl=%2F%09%2Fevil.example%2Fphish` (signed
// in) answered `Location: /<TAB>/evil.example/phish`, which Chromium follows off-site because the
// WHATWG URL parser drops tabs and newlines and reads "\" as "/" (URL Standard, "basic URL parser",
// from memory); `%0A` gave a 500 (a newline cannot go into a header). Only same-origin paths may
// survive, after decoding and refusing control characters and backslashes.
import { describe, expect, it } from 'vitest';
import * as signinPage from '../../routes/signin/+page.server';
import { safeCallbackUrl } from './auth';
import { createTestServices, createUser, makeEvent, outcome } from './test-support';

/** What a browser makes of a Location header value on our origin (Node's WHATWG URL parser). */
const followed = (location: string) => new URL(location, 'http://localhost:3000');

// Raw query-string values, as an attacker would put them in a link.
const hostile = [
	'%2F%09%2Fevil.example%2Fphish',
	'%2F%0A%2Fevil.example',
	'%0A',
	'%0D%0ASet-Cookie:%20x=1',
	'%2F%5Cevil.example',
	'%5C%2Fevil.example',
	'%2F%2Fevil.example',
	'%2F%2F%2Fevil.example',
	'%2F.%2F%2Fevil.example',
	'%2F..%2F%2Fevil.example',
	'%2F%252F%252Fevil.example',
	'%2F%25%30%39%2Fevil.example', // "/%09/evil.example": a tab once decoded again
	'%2F%00%2Fevil.example',
	'%2F%C2%85%2Fevil.example', // U+0085, a C1 control
	'https%3A%2F%2Fevil.example%2F',
	'http%3A%2Fevil.example',
	'%20%2F%2Fevil.example',
	'javascript%3Aalert(1)',
	'%2F%25', // a stray percent sign
	'evil.example'
];

describe('safeCallbackUrl keeps redirects on this site', () => {
	it.each(hostile)('callbackUrl=%s falls back to /', (raw) => {
		const value = new URLSearchParams(`callbackUrl=${raw}`).get('callbackUrl');
		const safe = safeCallbackUrl(value);
		expect(safe).toBe('/');
	});

	it.each([
		['/w/team/maps', '/w/team/maps'],
		['/w/team/maps?rev=2#frame-3', '/w/team/maps?rev=2#frame-3'],
		['/signin?callbackUrl=%2Fw%2Fteam', '/signin?callbackUrl=%2Fw%2Fteam'],
		['/w/team/../other', '/w/other']
	])('keeps the local path %s (as %s)', (value, expected) => {
		const safe = safeCallbackUrl(value);
		expect(safe).toBe(expected);
		expect(followed(safe).origin).toBe('http://localhost:3000');
	});

	it('whatever it is given, the result is a same-origin path with no control characters', () => {
		const decoded = hostile.map((raw) => new URLSearchParams(`v=${raw}`).get('v'));
		const inputs = [...decoded, ...hostile, 42, null];
		for (const input of inputs) {
			const safe = safeCallbackUrl(input);
			// eslint-disable-next-line no-control-regex -- checking that none are left
			expect(safe).not.toMatch(/[\u0000-\u001f\u007f\\]/);
			expect(followed(safe).origin).toBe('http://localhost:3000');
		}
	});
});

describe('the sign-in page redirects a signed-in person only within the site', () => {
	it.each(['%2F%09%2Fevil.example%2Fphish', '%0A', '%2F%0A%2Fevil.example'])(
		'/signin?callbackUrl=%s → 303 to /',
		async (raw) => {
			const services = await createTestServices();
			const user = await createUser(services.db, 'crew@example.test');
			const event = makeEvent<Parameters<typeof signinPage.load>[0]>({
				services,
				user,
				routeId: '/signin',
				path: `/signin?callbackUrl=${raw}`
			});
			const result = await outcome(() => signinPage.load(event));
			expect(result).toEqual({ kind: 'redirect', status: 303, location: '/' });
		}
	);
});
