// `npm start` (and `npm run demo`, which passes --demo): serves the production build.
// Settings come from the environment, then from a .env file in the working folder (the environment
// wins), then from the defaults below (see .env.example and README.md).
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { dirname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const env = process.env;
if (existsSync('.env')) process.loadEnvFile('.env');

// Demo mode only when asked for: it shows every sign-in link at /dev/mailbox.
if (process.argv.includes('--demo')) env.FRAMEWRIGHT_DEMO = '1';
const demo = ['1', 'true', 'yes'].includes(env.FRAMEWRIGHT_DEMO ?? '');

env.PORT ||= '3000';
env.DATABASE_PATH ||= 'data/framewright.db';
// adapter-node assumes https without ORIGIN, which would make SvelteKit refuse local form posts.
// Production must say where it is served (the links in e-mails); a demo runs on this machine.
if (demo) env.ORIGIN ||= `http://localhost:${env.PORT}`;
env.AUTH_TRUST_HOST ||= 'true';
// Capture uploads stream far past adapter-node's 512 KB default, so its one global limit is lifted;
// every route has its own limit instead, enforced before the body is read
// (src/lib/server/http/body-limits.ts; the upload route streams up to CAPTURE_MAX_BYTES).
env.BODY_SIZE_LIMIT ||= 'Infinity';
// On SIGTERM/SIGINT adapter-node lets running requests finish for this many seconds, then closes
// their connections; the process ends within 10 s in any case (below).
env.SHUTDOWN_TIMEOUT ||= '5';

const buildDir = resolve(env.FW_BUILD_DIR || 'build');
const entry = join(buildDir, 'index.js');
// The capture worker thread's bundle, written by `npm run build` (scripts/build-capture-worker.ts).
env.FW_CAPTURE_WORKER ||= join(buildDir, 'capture-worker.mjs');
if (!existsSync(entry)) {
	console.error(
		`No production build at ${entry}. Run \`npm run build\` first (or \`npm run demo\`).`
	);
	process.exit(1);
}
// Checks the settings, migrates the database and seeds an empty demo database before the server
// opens it (db/demo-start.ts, bundled by `npm run build` through scripts/build-demo-start.ts).
const demoStartFile = join(buildDir, 'demo-start.mjs');
if (!existsSync(demoStartFile)) {
	console.error(`The build at ${buildDir} has no demo-start.mjs. Run \`npm run build\` again.`);
	process.exit(1);
}
const { demoStart, settingsProblem } = await import(pathToFileURL(demoStartFile).href);
const problem = settingsProblem(env);
if (problem) {
	console.error(problem);
	process.exit(1);
}

if (!env.AUTH_SECRET) {
	// Generated once and kept beside the database, so sessions survive restarts.
	const secretFile = join(dirname(resolve(env.DATABASE_PATH)), 'auth-secret');
	if (!existsSync(secretFile)) {
		mkdirSync(dirname(secretFile), { recursive: true });
		writeFileSync(secretFile, randomBytes(32).toString('base64url'), { mode: 0o600 });
		console.log(`Generated AUTH_SECRET in ${secretFile}`);
	}
	env.AUTH_SECRET = readFileSync(secretFile, 'utf8').trim();
}

/** Resolves when the port can be listened on; otherwise explains and exits (no stack trace). */
async function checkPortFree(port, host) {
	const probe = createServer();
	const failure = await new Promise((done) => {
		probe.once('error', done);
		probe.listen({ port: Number(port), host: host || undefined }, () =>
			probe.close(() => done(null))
		);
	});
	if (!failure) return;
	const where = `${host || 'all addresses'} port ${port}`;
	if (failure.code === 'EADDRINUSE')
		console.error(
			`Port ${port} is already in use (another Framewright, or another program). Stop that program, or choose another port: PORT=${Number(port) + 1} npm start`
		);
	else if (failure.code === 'EACCES')
		console.error(
			`Not allowed to listen on ${where}. Choose a port above 1023: PORT=3000 npm start`
		);
	else console.error(`Cannot listen on ${where}: ${failure.message}`);
	process.exit(1);
}
await checkPortFree(env.PORT, env.HOST);

await demoStart();

// Whatever holds the process open after a stop signal, it ends within 10 s (adapter-node closes the
// HTTP server; src/lib/server/shutdown.ts closes the database, mail server and workers).
for (const signal of ['SIGTERM', 'SIGINT'])
	process.once(signal, () => {
		console.log(`Stopping (${signal})…`);
		setTimeout(() => {
			console.error('Stopping took longer than 10 s; exiting anyway.');
			process.exit(1);
		}, 10_000).unref();
	});

console.log(
	`Framewright on ${env.ORIGIN} (database ${env.DATABASE_PATH}${demo ? ', demo mode' : ''}). Stop with Ctrl+C.`
);
await import(pathToFileURL(entry).href);
