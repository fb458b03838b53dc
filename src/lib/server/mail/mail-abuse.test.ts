// Issue 10, finding 7: any account could create a workspace named like a phishing notice and send
// 50 invitations in half a second carrying that text and its address; 60 sign-in requests for
// different addresses from one client all sent mail. Now: names in mail are plain quoted text with
// links removed, only the product's own link is a link, and invitations and sign-in requests are
// limited per account and per client address.
//
// "Is it a link?" is answered by a mail reader, not by us: the message is composed by nodemailer's
// MailComposer and parsed by mailparser, whose `textAsHtml` turns every address it recognises into
// a link (it uses linkify-it, the autolinker of markdown-it), as mail programs do.
import type { RequestEvent } from '@sveltejs/kit';
import { simpleParser } from 'mailparser';
import MailComposer from 'nodemailer/lib/mail-composer';
import { describe, expect, it } from 'vitest';
import * as invitationsRoute from '../../../routes/api/workspaces/[ws]/invitations/+server';
import * as signinPage from '../../../routes/signin/+page.server';
import { authHandle } from '../auth';
import { createTeam, createTestServices, makeEvent, type TestServices } from '../test-support';
import type { OutgoingMail } from './send';
import { plainQuotedText } from './templates';

/** Every link a mail reader shows in the message: linkified plain text and the HTML's anchors. */
async function linksIn(mail: OutgoingMail): Promise<string[]> {
	const raw = await new MailComposer({ from: 'no-reply@framewright.test', ...mail })
		.compile()
		.build();
	const parsed = await simpleParser(raw);
	const html = `${parsed.textAsHtml ?? ''}${parsed.html || ''}`;
	return [...html.matchAll(/<a [^>]*href="([^"]*)"/g)].map((m) => m[1].replace(/&amp;/g, '&'));
}

const PHISH =
	'Security notice: your account is suspended! Verify now at https://evil.example/login, ' +
	'www.evil.example, evil.example/phish or help@evil.example\r\nBcc: victim@example.test';

function invite(
	services: TestServices,
	team: Awaited<ReturnType<typeof createTeam>>,
	email: string,
	client = '192.0.2.10' // TEST-NET-1 (RFC 5737), a documentation address
) {
	const event = makeEvent<RequestEvent>({
		services,
		user: team.users.owner,
		routeId: '/api/workspaces/[ws]/invitations',
		params: { ws: team.workspace.slug },
		method: 'POST',
		body: { email, role: 'viewer' }
	});
	event.getClientAddress = () => client;
	return invitationsRoute.POST(event as never) as Promise<Response>;
}

describe('workspace names in mail are plain quoted text (finding 7)', () => {
	it('an invitation from a workspace named like a phishing notice links only to the invitation', async () => {
		const services = await createTestServices();
		const team = await createTeam(services.db, PHISH.slice(0, 100));
		await services.db
			.updateTable('workspaces')
			.set({ name: PHISH })
			.where('id', '=', team.workspace.id)
			.execute();
		team.workspace.name = PHISH;
		expect((await invite(services, team, 'crew@example.test')).status).toBe(201);
		const [mail] = services.outbox;
		const links = await linksIn(mail);
		expect(links).toHaveLength(2); // the button and the address printed beneath it: the same link
		for (const link of links) expect(link).toMatch(/^http:\/\/localhost\/invite\/[\w-]+$/);
		expect(`${mail.subject}\n${mail.text}\n${mail.html}`).not.toMatch(/evil/i);
		expect(mail.subject).not.toMatch(/[\r\n]/);
		expect(mail.subject).toMatch(/^Invitation to the workspace "Security notice: .*"$/);
		expect(mail.text).toContain('[link removed]');
	});

	it.each([
		['Engine bench team', 'Engine bench team'],
		['Team "Alpha" v1.2', "Team 'Alpha' v1.2"],
		['see https://a.example/x now', 'see [link removed] now'],
		['ｅｖｉｌ。ｅｘａｍｐｌｅ', '[link removed]'], // full-width letters and dot (NFKC)
		['two\nlines', 'two lines']
	])('plainQuotedText(%j) → %j', (input, expected) => {
		expect(plainQuotedText(input)).toBe(expected);
	});

	it('clips a long name', () => {
		const clipped = plainQuotedText('x'.repeat(500));
		expect(clipped).toHaveLength(80);
		expect(clipped.endsWith('…')).toBe(true);
	});
});

describe('invitations are limited per account and per client address (finding 7)', () => {
	it('50 invitations in a burst from one account: the hourly limit, then 429 and no mail', async () => {
		const services = await createTestServices({ INVITATIONS_PER_ACCOUNT_PER_HOUR: '5' });
		const team = await createTeam(services.db, 'Burst team');
		const statuses: number[] = [];
		for (let i = 0; i < 50; i++) {
			// Each from another address, so only the per-account limit can stop them.
			const response = await invite(services, team, `person${i}@example.test`, `192.0.2.${i + 1}`);
			statuses.push(response.status);
			if (response.status === 429)
				expect(((await response.json()) as { error: string }).error).toMatch(
					/Too many invitations sent in the last hour; try again in about \d+ minutes?\./
				);
		}
		expect(statuses.filter((s) => s === 201)).toHaveLength(5);
		expect(statuses.filter((s) => s === 429)).toHaveLength(45);
		expect(services.outbox).toHaveLength(5);
		const pending = await services.db.selectFrom('invitations').select('id').execute();
		expect(pending).toHaveLength(5);
	});

	it('one client address is limited across accounts', async () => {
		const services = await createTestServices({ INVITATIONS_PER_CLIENT_PER_HOUR: '3' });
		const first = await createTeam(services.db, 'First team');
		const statuses: number[] = [];
		for (let i = 0; i < 3; i++)
			statuses.push((await invite(services, first, `a${i}@example.test`)).status);
		// Another account (another team's owner) from the same address.
		const owner2 = { ...first.users.owner, id: crypto.randomUUID(), email: 'owner2@example.test' };
		await services.db
			.insertInto('User')
			.values({ ...owner2, emailVerified: null, image: null })
			.execute();
		const { createWorkspace } = await import('../workspaces/workspaces');
		const ws2 = await createWorkspace(services.db, { name: 'Second team', ownerId: owner2.id });
		const second = { ...first, workspace: ws2, users: { ...first.users, owner: owner2 } };
		statuses.push((await invite(services, second, 'b@example.test')).status);
		statuses.push((await invite(services, second, 'c@example.test', '198.51.100.7')).status);
		expect(statuses).toEqual([201, 201, 201, 429, 201]);
	});
});

describe('sign-in requests are limited per client address (finding 7)', () => {
	function signIn(services: TestServices, email: string, client: string) {
		const form = new FormData();
		form.set('email', email);
		const event = makeEvent<Parameters<typeof signinPage.actions.default>[0]>({
			services,
			user: null,
			routeId: '/signin',
			body: form
		});
		event.getClientAddress = () => client;
		return signinPage.actions.default(event).catch((thrown: unknown) => thrown);
	}

	it('60 requests for different addresses from one client send only the hourly limit', async () => {
		const services = await createTestServices({ SIGNIN_REQUESTS_PER_CLIENT_PER_HOUR: '10' });
		const answers = [];
		for (let i = 0; i < 60; i++)
			answers.push(await signIn(services, `driver${i}@example.test`, '203.0.113.5'));
		expect(services.outbox).toHaveLength(10);
		const refused = answers.filter((a) => (a as { status?: number }).status === 429) as {
			data: { errors: { email: string[] } };
		}[];
		expect(refused).toHaveLength(50);
		expect(refused[0].data.errors.email[0]).toMatch(/Too many sign-in requests from your network/);
		// Another client is not affected.
		await signIn(services, 'calm@example.test', '203.0.113.99');
		expect(services.outbox).toHaveLength(11);
	});

	it("Auth.js's own sign-in post cannot be used to get around the limit (404)", async () => {
		const services = await createTestServices();
		const event = makeEvent<RequestEvent>({
			services,
			user: null,
			routeId: '/auth/[...rest]',
			path: '/auth/signin/nodemailer',
			method: 'POST',
			body: new URLSearchParams({ email: 'x@example.test' }).toString()
		});
		const response = await authHandle({
			event,
			resolve: async () => new Response('resolved')
		});
		expect(response.status).toBe(404);
		expect(services.outbox).toEqual([]);
	});
});
