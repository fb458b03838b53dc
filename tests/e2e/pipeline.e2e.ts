import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

// A build server's day, against the running production build: a person makes a read-only access
// token on the tokens page, and the example build script (scripts/remote-pipeline.sh) uses it to
// pull r1 of the demo map, lint it, generate C, compile it with gcc, upload a capture and download
// its decoded CSV. The decoded CSV is checked against the local `decode` command over the same file
// with the pulled map. Pages and form actions refuse the token; the API takes it until it is revoked.
const slug = 'quillmoor-club-racing';
const MAP = 'Club racer engine controller';
const run = promisify(execFile);

test('a read-only token runs the whole pipeline from the command line, and stops when revoked', async ({
	page,
	baseURL
}) => {
	test.setTimeout(180_000);
	await signIn(page, 'tuner@framewright.test');
	await page.goto(`/w/${slug}/tokens`);
	await expect(page.getByRole('heading', { level: 1, name: 'Access tokens' })).toBeVisible();
	// The tuner is a viewer: an edit token is not on offer.
	await expect(page.getByLabel('Access').locator('option[value="editor"]')).toBeDisabled();
	const name = `Firmware build ${Date.now().toString(36)}`;
	await page.getByLabel('Name').fill(name);
	await page.getByLabel('Expires after').selectOption('7');
	await page.getByRole('button', { name: 'Create token' }).click();
	const shown = page.getByLabel('Your new token');
	await expect(shown).toHaveValue(/^fwt_/);
	const token = await shown.inputValue();
	const row = page.getByRole('row', { name: new RegExp(name) });
	await expect(row).toContainText('Read-only');
	await expect(row).toContainText('active');
	const headers = await page.getByRole('columnheader').allTextContents();
	const lastUsed = row.locator('th, td').nth(headers.findIndex((h) => h.trim() === 'Last used'));
	await expect(lastUsed).toHaveText('never');

	const out = mkdtempSync(join(tmpdir(), 'fw-pipeline-'));
	try {
		const capture = 'fixtures/club-racer-session.csv';
		const script = await run(
			'bash',
			['scripts/remote-pipeline.sh', baseURL!, MAP, '1', capture, out],
			{ env: { ...process.env, FRAMEWRIGHT_TOKEN: token }, timeout: 120_000 }
		);
		expect(script.stderr).toContain('pipeline done');

		expect(JSON.parse(readFileSync(join(out, 'pull.json'), 'utf8'))).toMatchObject({
			revision: 'r1',
			map: { name: MAP }
		});
		const lint = JSON.parse(readFileSync(join(out, 'lint.json'), 'utf8')) as { severity: string }[];
		expect(lint.filter((p) => p.severity === 'error')).toEqual([]);
		const header = readFileSync(join(out, 'c', 'fw.h'), 'utf8');
		expect(header).toContain(MAP);
		expect(header).toMatch(/Revision:\s+r1\b/);
		expect(existsSync(join(out, 'c', 'fw.o'))).toBe(true);
		const { capture: uploaded } = JSON.parse(readFileSync(join(out, 'capture.json'), 'utf8'));
		expect(uploaded.status).toBe('ready');

		const decoded = readFileSync(join(out, 'decoded.csv'), 'utf8').trim().split('\n');
		expect(decoded[0]).toBe('time,frame,signal,value,unit');
		const local = await run(
			'npm',
			['run', '-s', 'cli', '--', 'decode', '--map', join(out, 'map.json'), capture],
			{ maxBuffer: 64 << 20 }
		);
		const localRows = local.stdout.trim().split('\n');
		expect(decoded.length).toBe(localRows.length);
		// Sample by sample, whatever order each side writes them in (times to the local 6 decimals).
		const keyed = (line: string): [string, number] => {
			const [time, frame, signal, value] = line.split(',');
			return [`${frame}/${signal}/${Number(time).toFixed(6)}`, Number(value)];
		};
		// Compared in plain code and asserted once: tens of thousands of expect() calls, each a traced
		// step, would take minutes.
		const expected = new Map(localRows.slice(1).map(keyed));
		const disagreeing = decoded.slice(1).filter((line) => {
			const [key, value] = keyed(line);
			const local = expected.get(key);
			return local === undefined || !(Math.abs(local - value) < 5e-10);
		});
		expect(disagreeing.slice(0, 5)).toEqual([]);
		expect(expected.size).toBe(localRows.length - 1);
	} finally {
		rmSync(out, { recursive: true, force: true });
	}

	// The API takes the token; a page and a form action refuse it.
	const bearer = { authorization: `Bearer ${token}` };
	const api = await page.request.get(`/api/workspaces/${slug}/maps`, {
		headers: bearer,
		failOnStatusCode: false
	});
	expect(api.status()).toBe(200);
	const context = await page.context().browser()!.newContext({ baseURL });
	const anonymous = context.request;
	const pageWithToken = await anonymous.get(`/w/${slug}/maps`, {
		headers: bearer,
		maxRedirects: 0
	});
	expect(pageWithToken.status()).toBe(403);
	const action = await anonymous.post(`/w/${slug}/tokens?/create`, {
		headers: {
			...bearer,
			origin: baseURL!,
			accept: 'application/json',
			'x-sveltekit-action': 'true'
		},
		form: { name: 'minted by a token', role: 'viewer', expiresInDays: '7' },
		maxRedirects: 0
	});
	expect(action.status()).toBe(403);
	expect(JSON.parse(await action.text())).toMatchObject({
		type: 'error',
		error: { message: expect.stringContaining('Sign in') }
	});
	// Without JavaScript (a plain form post) the action is refused the same way.
	const plainAction = await anonymous.post(`/w/${slug}/tokens?/create`, {
		headers: { ...bearer, origin: baseURL! },
		form: { name: 'minted by a token', role: 'viewer', expiresInDays: '7' },
		maxRedirects: 0
	});
	expect(plainAction.status()).toBe(403);
	await context.close();

	// The person sees the token's last use; nothing was made with it on the form.
	await page.reload();
	// Shown once: a reload lists the token but never shows it again.
	await expect(page.getByLabel('Your new token')).toHaveCount(0);
	await expect(page.getByText(token.slice(20))).toHaveCount(0);
	await expect(lastUsed).not.toHaveText('never');
	await expect(lastUsed).toHaveText(/\d/);
	await expect(page.getByRole('row', { name: /minted by a token/ })).toHaveCount(0);

	// Revoked on the page: the next API call is a 401 with no word about any workspace.
	await page.getByRole('button', { name: `Revoke token ${name}` }).click();
	await expect(page.getByText(`Token “${name}” revoked`)).toBeVisible();
	const after = await page.request.get(`/api/workspaces/${slug}/maps`, {
		headers: bearer,
		failOnStatusCode: false
	});
	expect(after.status()).toBe(401);
	expect(await after.text()).not.toContain(slug);
});
