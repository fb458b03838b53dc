// A Framewright server of a test's own, from the production build the suite made (`npm run build`
// in playwright.config.ts), started the way `npm start` starts it (`node scripts/serve.js`), with
// its own temporary folder for the database and store. For tests of starting and stopping, and of
// settings the suite's shared server does not have.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const projectRoot = resolve(import.meta.dirname, '../..');
export const serveScript = join(projectRoot, 'scripts/serve.js');
export const buildDir = resolve(projectRoot, process.env.FW_BUILD_DIR ?? 'build');

/** A port nobody listens on right now. */
export async function freePort(): Promise<number> {
	const server = createServer();
	await new Promise<void>((ready) => server.listen(0, '127.0.0.1', ready));
	const { port } = server.address() as { port: number };
	await new Promise((done) => server.close(done));
	return port;
}

export interface OwnServer {
	child: ChildProcess;
	port: number;
	folder: string;
	/** Everything printed so far (stdout and stderr). */
	output(): string;
	/** Resolves with the exit code (or signal) when the process ends. */
	exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
	/** Stops it if still running and removes its folder. */
	dispose(): Promise<void>;
}

/**
 * Starts `node scripts/serve.js` with `env` on top of a clean environment (PATH, HOME) and a fresh
 * folder for its data. It runs in that folder (so only a .env the test writes there is read), or in
 * the project for demo mode, whose seed reads fixtures/.
 */
export async function startOwnServer(
	env: Record<string, string>,
	options: {
		args?: string[];
		folder?: string;
		/** Only `env` (with PATH, HOME and the build folder): the settings must come from a .env. */
		bare?: boolean;
		/** The port it will listen on, when `env` does not say (a bare start reading .env). */
		port?: number;
	} = {}
): Promise<OwnServer> {
	const folder = options.folder ?? mkdtempSync(join(tmpdir(), 'fw-e2e-own-'));
	const port = env.PORT ? Number(env.PORT) : (options.port ?? (await freePort()));
	const defaults = options.bare
		? {}
		: {
				PORT: String(port),
				DATABASE_PATH: join(folder, 'framewright.db'),
				STORAGE_ROOT: join(folder, 'storage'),
				STANDIN_SMTP_PORT: '0',
				AUTH_SECRET: 'e2e-own-server-secret-0123456789abcdef0123456789'
			};
	const child = spawn(process.execPath, [serveScript, ...(options.args ?? [])], {
		// The demo seed reads fixtures/ from the working folder, as `npm run demo` runs in the project.
		cwd: env.FRAMEWRIGHT_DEMO === '1' ? projectRoot : folder,
		env: {
			PATH: process.env.PATH ?? '',
			HOME: process.env.HOME ?? '',
			FW_BUILD_DIR: buildDir,
			...defaults,
			...env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let text = '';
	child.stdout?.on('data', (b: Buffer) => (text += b.toString()));
	child.stderr?.on('data', (b: Buffer) => (text += b.toString()));
	const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((done) =>
		child.once('exit', (code, signal) => done({ code, signal }))
	);
	return {
		child,
		port,
		folder,
		output: () => text,
		exited,
		async dispose() {
			if (child.exitCode === null && child.signalCode === null) {
				child.kill('SIGKILL');
				await exited;
			}
			rmSync(folder, { recursive: true, force: true });
		}
	};
}

/** Waits until GET /healthz answers 200 (or the process ends, which throws with its output). */
export async function waitUntilHealthy(server: OwnServer, timeoutMs = 60_000): Promise<void> {
	const deadline = Date.now() + timeoutMs;
	let ended = false;
	void server.exited.then(() => (ended = true));
	while (Date.now() < deadline) {
		if (ended) throw new Error(`the server ended before answering:\n${server.output()}`);
		try {
			const response = await fetch(`http://127.0.0.1:${server.port}/healthz`);
			if (response.status === 200) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`the server did not become healthy in ${timeoutMs} ms:\n${server.output()}`);
}
