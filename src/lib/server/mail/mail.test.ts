import { describe, expect, it } from 'vitest';
import * as mailboxPage from '../../../routes/dev/mailbox/+page.server';
import { createTestServices, makeEvent, outcome } from '../test-support';
import { extractLinks, listMailboxMessages } from './mailbox';
import { createSendMail } from './send';
import { startStandInSmtp } from './standin-smtp';
import { signInMail } from './templates';

describe('stand-in SMTP server and mailbox', () => {
	it('receives real SMTP from sendMail and keeps the message with its links, newest first', async () => {
		const { db } = await createTestServices();
		const server = await startStandInSmtp(db, 0);
		try {
			const sendMail = createSendMail(
				{ host: '127.0.0.1', port: server.port, plain: true },
				'Framewright <no-reply@framewright.test>'
			);
			const url =
				'http://localhost:3000/auth/callback/nodemailer?callbackUrl=%2F&token=abc123&email=crew%40example.test';
			await sendMail(signInMail('crew@example.test', url, new Date(Date.now() + 3_600_000)));
			await sendMail({ to: 'other@example.test', subject: 'Second', text: 'No links here.' });

			const all = await listMailboxMessages(db);
			expect(all.map((m) => m.subject)).toEqual(['Second', 'Your Framewright sign-in link']);
			const [mine] = await listMailboxMessages(db, { to: 'Crew@Example.test' });
			expect(mine).toMatchObject({ to: 'crew@example.test', links: [url] });
			expect(mine.text).toContain('works once');
		} finally {
			await server.close();
		}
	});

	it('finds links in plain text without trailing punctuation', () => {
		expect(
			extractLinks(
				'Open <https://a.test/x?y=1> or (http://b.test/z), then https://c.test/p. Again https://a.test/x?y=1'
			)
		).toEqual(['https://a.test/x?y=1', 'http://b.test/z', 'https://c.test/p']);
	});

	it('is hidden (404) outside demo mode', async () => {
		const services = await createTestServices({
			FRAMEWRIGHT_DEMO: '0',
			SMTP_HOST: 'smtp.example.test'
		});
		expect(services.config.demoMode).toBe(false);
		const event = makeEvent({ services, user: null, routeId: '/dev/mailbox' });
		expect(await outcome(() => mailboxPage.load(event as never))).toMatchObject({
			kind: 'error',
			status: 404
		});
	});
});
