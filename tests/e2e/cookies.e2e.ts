// Issue 10, finding 13: the session cookie's Secure flag was left to Auth.js's reading of each
// request, and once a session refresh answered a plain-http request with a Secure session cookie,
// which a browser drops over http (a shop's server on its own network would lose its sessions).
// Now the cookie policy follows ORIGIN's scheme. Chromium, with a non-localhost name mapped to
// loopback (--host-resolver-rules; traffic stays on 127.0.0.1), signs in at a plain-http origin of
// a server of this test's own; then session refreshes, one of them on a request a proxy marked as
// https (X-Forwarded-Proto), keep a non-Secure cookie of the same name and the person signed in.
import { chromium, expect, test } from '@playwright/test';
import { signIn } from './helpers';
import { freePort, startOwnServer, waitUntilHealthy } from './own-server';

test('sign-in and session refreshes at http://framewright.test keep a non-Secure session cookie', async () => {
	test.setTimeout(120_000);
	const port = await freePort();
	const origin = `http://framewright.test:${port}`;
	const server = await startOwnServer({
		FRAMEWRIGHT_DEMO: '1',
		ORIGIN: origin,
		PORT: String(port)
	});
	const browser = await chromium.launch({
		executablePath: '/usr/bin/chromium',
		args: ['--no-sandbox', '--disable-gpu', '--host-resolver-rules=MAP framewright.test 127.0.0.1']
	});
	try {
		await waitUntilHealthy(server);
		const context = await browser.newContext({ baseURL: origin });
		const page = await context.newPage();
		await signIn(page, 'calibrator@framewright.test');

		const session = () =>
			context
				.cookies(origin)
				.then((all) => all.filter((c) => /authjs\.session-token$/.test(c.name)));
		expect(await session()).toEqual([
			expect.objectContaining({
				name: 'authjs.session-token',
				domain: 'framewright.test',
				secure: false,
				httpOnly: true
			})
		]);

		// A session refresh: every page answer sets the session cookie again with a new expiry.
		const refreshed = await page.goto('/');
		const setCookie = (await refreshed!.allHeaders())['set-cookie'] ?? '';
		expect(setCookie).toMatch(/(^|\n)authjs\.session-token=/);
		expect(setCookie).not.toMatch(/;\s*secure/i);

		// The same behind a proxy that says https: the policy is ORIGIN's, not the header's.
		await page.setExtraHTTPHeaders({ 'x-forwarded-proto': 'https' });
		const viaProxy = await page.goto('/');
		const proxied = (await viaProxy!.allHeaders())['set-cookie'] ?? '';
		expect(proxied).toMatch(/(^|\n)authjs\.session-token=/);
		expect(proxied).not.toMatch(/;\s*secure|__Secure-|__Host-/i);
		await expect(page.getByRole('button', { name: /account menu/i })).toBeVisible();

		await page.setExtraHTTPHeaders({});
		await page.reload();
		await expect(page.getByRole('button', { name: /account menu/i })).toBeVisible();
		expect(await session()).toHaveLength(1);
	} finally {
		await browser.close();
		await server.dispose();
	}
});
