// Issue 10, finding 10: no security headers, so pages could be framed. Now every page has
// SvelteKit's Content-Security-Policy with a fresh script nonce and `frame-ancestors 'none'`, and
// every response `X-Content-Type-Options: nosniff`, `Referrer-Policy` and `X-Frame-Options`
// (HSTS only when ORIGIN is https; this suite runs on plain http). Chromium itself judges the policy:
// a framed page is refused, and signing in, decoding and plotting (uPlot, Svelte's inline styles)
// log no policy violation.
import { expect, test } from '@playwright/test';
import { decodeWithLatest, DEMO_SLUG, plotChannel } from './capture-helpers';
import { signIn } from './helpers';

test('pages carry a nonce CSP that forbids framing, and the other security headers', async ({
	request
}) => {
	const first = await request.get('/signin');
	const second = await request.get('/signin');
	const headers = first.headers();
	const csp = headers['content-security-policy'];
	expect(csp).toContain("frame-ancestors 'none'");
	expect(csp).toContain("default-src 'self'");
	const nonce = /script-src 'self' 'nonce-([^']+)'/.exec(csp)?.[1];
	expect(nonce).toBeTruthy();
	expect(second.headers()['content-security-policy']).not.toContain(nonce!); // fresh per response
	// The inline script of the page carries it (the theme script in src/app.html).
	expect(await first.text()).toContain(`<script nonce="${nonce}">`);
	expect(headers['x-content-type-options']).toBe('nosniff');
	expect(headers['x-frame-options']).toBe('DENY');
	expect(headers['referrer-policy']).toBe('same-origin');
	expect(headers['strict-transport-security']).toBeUndefined();
	// Downloads and JSON too.
	const health = await request.get('/healthz');
	expect(health.headers()['x-content-type-options']).toBe('nosniff');
});

test('another site cannot frame a page', async ({ page, baseURL }) => {
	await page.setContent(
		`<iframe name="app" src="${baseURL}/signin" width="600" height="400"></iframe>`
	);
	const frame = page.frame({ name: 'app' });
	await expect.poll(() => frame?.url()).toMatch(/^chrome-error:|^about:blank/);
	expect(await frame!.locator('input[name="email"]').count()).toBe(0);
});

test('signing in, decoding and plotting log no Content-Security-Policy violation', async ({
	page
}) => {
	test.setTimeout(120_000);
	const violations: string[] = [];
	page.on('console', (message) => {
		if (/Content Security Policy|Content-Security-Policy/i.test(message.text()))
			violations.push(message.text());
	});
	await signIn(page, 'tuner@framewright.test');
	await page.goto(`/w/${DEMO_SLUG}/captures`);
	// Other journeys upload files of the same name; the seeded one is already processed.
	await page
		.getByRole('row')
		.filter({ hasText: 'genset-idle.csv' })
		.filter({ hasText: 'Ready' })
		.last()
		.getByRole('link', { name: /genset-idle/ })
		.click();
	await decodeWithLatest(page);
	await plotChannel(page, 'EEC1 · EngineSpeed');
	const plot = page.getByTestId('plot-area');
	await expect(plot.locator('.uplot')).toHaveCount(1, { timeout: 20_000 });
	// uPlot draws on a canvas it sizes with inline styles: a blocked style would leave it 0 px wide.
	// Polled: the plot is rebuilt once the channel's samples arrive, replacing the canvas.
	const canvas = plot.locator('.uplot canvas').first();
	await expect
		.poll(async () => (await canvas.boundingBox())?.width ?? 0, { timeout: 20_000 })
		.toBeGreaterThan(100);
	expect(violations).toEqual([]);
});
