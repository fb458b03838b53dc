import { Auth, skipCSRFCheck } from '@auth/core';
import { afterEach, describe, expect, it, vi } from 'vitest';
import * as signinPage from '../../routes/signin/+page.server';
import { requestSignInLink, safeCallbackUrl } from './auth';
import { createAuthConfig } from './auth-config';
import { claimSigninLink } from './signin-requests';
import { extractLinks } from './mail/mailbox';
import {
	countRows,
	createTestServices,
	makeEvent,
	outcome,
	type TestServices
} from './test-support';

const origin = 'http://localhost';

// Drives Auth.js itself (the same handler hooks.server.ts mounts under /auth) with our settings.
function authFor(services: TestServices) {
	const config = { ...createAuthConfig(services), skipCSRFCheck } as unknown as Parameters<
		typeof Auth
	>[1];
	return (request: Request) => Auth(request, config);
}

async function askForLink(services: TestServices, email: string): Promise<string> {
	return requestSignInLink(services, origin, email, '/w/team/maps');
}

function lastLink(services: TestServices): string {
	const mail = services.outbox.at(-1);
	if (!mail) throw new Error('no mail sent');
	const [link] = extractLinks(mail.text);
	return link;
}

afterEach(() => {
	vi.useRealTimers();
});

describe('sign-in by e-mail link', () => {
	it('e-mails a link that signs the person in once and creates a database session', async () => {
		const services = await createTestServices();
		expect(await askForLink(services, 'Driver@Example.test')).toBe('/signin/check');
		expect(services.outbox).toHaveLength(1);
		expect(services.outbox[0]).toMatchObject({
			to: 'driver@example.test',
			subject: 'Your Framewright sign-in link'
		});
		const link = lastLink(services);
		expect(link).toMatch(/^http:\/\/localhost\/auth\/callback\/nodemailer\?/);
		// Only a hash of the token is stored.
		const token = new URL(link).searchParams.get('token');
		const stored = await services.db
			.selectFrom('VerificationToken')
			.selectAll()
			.executeTakeFirstOrThrow();
		expect(stored.token).not.toBe(token);

		const response = await authFor(services)(new Request(link));
		expect(response.status).toBe(302);
		expect(response.headers.get('location')).toBe('http://localhost/w/team/maps');
		expect(response.headers.getSetCookie().some((c) => c.startsWith('authjs.session-token='))).toBe(
			true
		);
		expect(await countRows(services.db, 'Session')).toBe(1);
		const user = await services.db.selectFrom('User').selectAll().executeTakeFirstOrThrow();
		expect(user.email).toBe('driver@example.test');
	});

	it('refuses a link used a second time', async () => {
		const services = await createTestServices();
		await askForLink(services, 'once@example.test');
		const link = lastLink(services);
		const auth = authFor(services);
		expect((await auth(new Request(link))).headers.get('location')).toBe(
			'http://localhost/w/team/maps'
		);
		const again = await auth(new Request(link));
		expect(again.headers.get('location')).toBe('http://localhost/signin/error?error=Verification');
		expect(await countRows(services.db, 'Session')).toBe(1);
	});

	it('refuses an expired link (configured lifetime, default 60 minutes)', async () => {
		const services = await createTestServices();
		expect(services.config.signinLinkMaxAgeSeconds).toBe(3600);
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2026-12-01T10:00:00Z'));
		await askForLink(services, 'late@example.test');
		const link = lastLink(services);
		vi.setSystemTime(new Date('2026-12-01T11:00:01Z'));
		const response = await authFor(services)(new Request(link));
		expect(response.headers.get('location')).toBe(
			'http://localhost/signin/error?error=Verification'
		);
		expect(await countRows(services.db, 'Session')).toBe(0);
		expect(await countRows(services.db, 'User')).toBe(0);
	});

	it('accepts a link just before it expires, and honours SIGNIN_LINK_MAX_AGE_MINUTES', async () => {
		const services = await createTestServices({ SIGNIN_LINK_MAX_AGE_MINUTES: '10' });
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2026-12-01T10:00:00Z'));
		await askForLink(services, 'quick@example.test');
		const stored = await services.db
			.selectFrom('VerificationToken')
			.selectAll()
			.executeTakeFirstOrThrow();
		expect(new Date(stored.expires).toISOString()).toBe('2026-12-01T10:10:00.000Z');
		vi.setSystemTime(new Date('2026-12-01T10:09:59Z'));
		const response = await authFor(services)(new Request(lastLink(services)));
		expect(response.headers.get('location')).toBe('http://localhost/w/team/maps');
	});

	it('keeps sessions for SESSION_MAX_AGE_DAYS (default 30)', async () => {
		const services = await createTestServices();
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2026-12-01T10:00:00Z'));
		await askForLink(services, 'long@example.test');
		await authFor(services)(new Request(lastLink(services)));
		const session = await services.db.selectFrom('Session').selectAll().executeTakeFirstOrThrow();
		expect(new Date(session.expires).toISOString()).toBe('2026-12-31T10:00:00.000Z');
	});

	it('sends at most SIGNIN_LINKS_PER_HOUR links per address, answering the same way every time', async () => {
		const services = await createTestServices({ SIGNIN_LINKS_PER_HOUR: '3' });
		vi.useFakeTimers({ toFake: ['Date'] });
		vi.setSystemTime(new Date('2026-12-01T10:00:00Z'));
		const answers: string[] = [];
		for (let i = 0; i < 5; i++) answers.push(await askForLink(services, 'busy@example.test'));
		expect(new Set(answers)).toEqual(new Set(['/signin/check']));
		expect(services.outbox.filter((m) => m.to === 'busy@example.test')).toHaveLength(3);
		// Another address is not affected.
		await askForLink(services, 'calm@example.test');
		expect(services.outbox.filter((m) => m.to === 'calm@example.test')).toHaveLength(1);
		// An hour after the first counted link the window reopens.
		vi.setSystemTime(new Date('2026-12-01T11:00:01Z'));
		await askForLink(services, 'busy@example.test');
		expect(services.outbox.filter((m) => m.to === 'busy@example.test')).toHaveLength(4);
	});

	it('counts the hourly limit per address, case-insensitively, with a sliding window', async () => {
		const services = await createTestServices();
		const t0 = Date.parse('2026-12-01T10:00:00Z');
		const minute = 60_000;
		const results = [];
		for (let i = 0; i < 3; i++)
			results.push(await claimSigninLink(services.db, 'A@example.test', 2, t0 + i * minute));
		expect(results).toEqual([true, true, false]);
		expect(await claimSigninLink(services.db, 'a@example.test', 2, t0 + 59 * minute)).toBe(false);
		// The first link is an hour old: one slot frees up, and only one.
		expect(await claimSigninLink(services.db, 'a@example.test', 2, t0 + 60 * minute)).toBe(true);
		expect(await claimSigninLink(services.db, 'a@example.test', 2, t0 + 60 * minute)).toBe(false);
	});
});

describe('the /signin form action', () => {
	it('rejects a malformed address with a field error and stores nothing', async () => {
		const services = await createTestServices();
		const form = new FormData();
		form.set('email', 'not-an-address');
		const event = makeEvent<Parameters<typeof signinPage.actions.default>[0]>({
			services,
			user: null,
			routeId: '/signin',
			body: form
		});
		const result = (await signinPage.actions.default(event)) as {
			status: number;
			data: { errors: { email?: string[] } };
		};
		expect(result.status).toBe(400);
		expect(result.data.errors.email?.[0]).toMatch(/valid e-mail/);
		expect(await countRows(services.db, 'VerificationToken')).toBe(0);
		expect(await countRows(services.db, 'signin_requests')).toBe(0);
		expect(services.outbox).toEqual([]);
	});

	it('sends the link and redirects to the check-your-inbox page, keeping only local callback URLs', async () => {
		const services = await createTestServices();
		const form = new FormData();
		form.set('email', ' crew@example.test ');
		form.set('callbackUrl', 'https://elsewhere.example/steal');
		const event = makeEvent<Parameters<typeof signinPage.actions.default>[0]>({
			services,
			user: null,
			routeId: '/signin',
			body: form
		});
		expect(await outcome(() => signinPage.actions.default(event))).toEqual({
			kind: 'redirect',
			status: 303,
			location: '/signin/check'
		});
		expect(new URL(lastLink(services)).searchParams.get('callbackUrl')).toBe('http://localhost/');
	});

	it.each([
		['/w/team/maps', '/w/team/maps'],
		['//evil.example/', '/'],
		['/\\evil.example', '/'],
		['https://evil.example/', '/'],
		[null, '/']
	])('safeCallbackUrl(%s) → %s', (input, expected) => {
		expect(safeCallbackUrl(input)).toBe(expected);
	});
});
