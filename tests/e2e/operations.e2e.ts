// Issue 10, operations, against the production build started as `npm start` starts it
// (`node scripts/serve.js`). No browser: the process, its output and its HTTP answers.
//  12: in demo mode SIGTERM/SIGINT never ended the process (the stand-in SMTP server kept it alive);
//  14: demo mode switched itself on whenever SMTP_HOST was empty (so anyone could read any sign-in
//      link at /dev/mailbox on a production host that forgot its mail settings);
//  15: .env was never read; a taken port ended in a raw EADDRINUSE stack trace.
// Plus GET /healthz (database reachable, storage writable).
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test } from '@playwright/test';
import { freePort, startOwnServer, waitUntilHealthy, type OwnServer } from './own-server';

const servers: OwnServer[] = [];
test.afterEach(async () => {
	await Promise.all(servers.splice(0).map((s) => s.dispose()));
});
async function own(...args: Parameters<typeof startOwnServer>): Promise<OwnServer> {
	const server = await startOwnServer(...args);
	servers.push(server);
	return server;
}

for (const signal of ['SIGTERM', 'SIGINT'] as const) {
	test(`demo mode ends within 10 s on ${signal}, closing its mail server (finding 12)`, async () => {
		const server = await own({ FRAMEWRIGHT_DEMO: '1' });
		await waitUntilHealthy(server);
		const health = await (await fetch(`http://127.0.0.1:${server.port}/healthz`)).json();
		expect(health).toEqual({ status: 'ok', database: { ok: true }, storage: { ok: true } });

		const started = Date.now();
		server.child.kill(signal);
		const outcome = await Promise.race([
			server.exited,
			new Promise<'still running'>((r) => setTimeout(() => r('still running'), 10_000))
		]);
		expect(outcome, server.output()).toEqual({ code: 0, signal: null });
		expect(Date.now() - started).toBeLessThan(10_000);
		expect(server.output()).toContain('Framewright stopped.');
	});
}

test('npm start without mail settings refuses to start and names them (finding 14)', async () => {
	const server = await own({});
	const outcome = await server.exited;
	expect(outcome.code).toBe(1);
	const output = server.output();
	expect(output).toContain('Framewright will not start: it needs SMTP_HOST');
	expect(output).toContain('MAIL_FROM');
	expect(output).toContain('ORIGIN');
	expect(output).toContain('npm run demo');
	expect(output).not.toMatch(/^\s+at /m); // a message, not a stack trace
});

test('with mail settings it starts in production mode: no mailbox page (finding 14)', async () => {
	const port = await freePort();
	const server = await own({
		PORT: String(port),
		ORIGIN: `http://127.0.0.1:${port}`,
		SMTP_HOST: '127.0.0.1',
		SMTP_PORT: String(await freePort()), // nothing listens: no mail is sent in this test
		MAIL_FROM: 'Framewright <no-reply@example.test>'
	});
	await waitUntilHealthy(server);
	expect(server.output()).not.toContain('demo mode');
	const mailbox = await fetch(`http://127.0.0.1:${port}/dev/mailbox`);
	expect(mailbox.status).toBe(404);
});

test('settings are read from .env in the working folder (finding 15)', async () => {
	const folder = mkdtempSync(join(tmpdir(), 'fw-e2e-dotenv-'));
	const port = await freePort();
	writeFileSync(
		join(folder, '.env'),
		[
			'# Written by the test: nothing of this is in the environment',
			`PORT=${port}`,
			`ORIGIN=http://127.0.0.1:${port}`,
			'SMTP_HOST=127.0.0.1',
			`SMTP_PORT=${await freePort()}`,
			'MAIL_FROM="Framewright <no-reply@example.test>"',
			`DATABASE_PATH=${join(folder, 'from-dotenv.db')}`,
			`STORAGE_ROOT=${join(folder, 'storage')}`
		].join('\n')
	);
	const server = await own({}, { folder, bare: true, port });
	await waitUntilHealthy(server);
	expect(server.output()).toContain(`Framewright on http://127.0.0.1:${port} (database`);
	expect(server.output()).toContain('from-dotenv.db');
	expect(existsSync(join(folder, 'from-dotenv.db'))).toBe(true);
});

test('a taken port gets a clear message, not a stack trace (finding 15)', async () => {
	const blocker = createServer();
	const port = await freePort();
	await new Promise<void>((ready) => blocker.listen(port, ready));
	try {
		const server = await own({ FRAMEWRIGHT_DEMO: '1', PORT: String(port) });
		const outcome = await server.exited;
		expect(outcome.code).toBe(1);
		expect(server.output()).toContain(
			`Port ${port} is already in use (another Framewright, or another program).`
		);
		expect(server.output()).toContain(`PORT=${port + 1} npm start`);
		expect(server.output()).not.toMatch(/EADDRINUSE|^\s+at /m);
	} finally {
		await new Promise((done) => blocker.close(done));
	}
});
