// `npm start`: serves the production build with sensible defaults for a local or demo run.
// Every default yields to a value already set in the environment (see .env.example).
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const env = process.env;
env.PORT ||= '3000';
env.DATABASE_PATH ||= 'data/framewright.db';
// adapter-node assumes https without ORIGIN, which would make SvelteKit refuse local form posts.
env.ORIGIN ||= `http://localhost:${env.PORT}`;
env.AUTH_TRUST_HOST ||= 'true';
// Capture uploads stream far past adapter-node's 512 KB default; the upload route enforces its own
// limit (CAPTURE_MAX_BYTES) while streaming, so the adapter's is lifted.
env.BODY_SIZE_LIMIT ||= 'Infinity';
if (!env.SMTP_HOST) {
	// No real mail server: demo mode, with the stand-in SMTP server and the /dev/mailbox page.
	env.FRAMEWRIGHT_DEMO ||= '1';
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
// Migrates the database and seeds an empty demo database before the server opens it
// (db/demo-start.ts, bundled by `npm run build` through scripts/build-demo-start.ts).
const demoStartFile = join(buildDir, 'demo-start.mjs');
if (!existsSync(demoStartFile)) {
	console.error(`The build at ${buildDir} has no demo-start.mjs. Run \`npm run build\` again.`);
	process.exit(1);
}
const { demoStart } = await import(pathToFileURL(demoStartFile).href);
await demoStart();
console.log(
	`Framewright on ${env.ORIGIN} (database ${env.DATABASE_PATH}${env.FRAMEWRIGHT_DEMO === '1' ? ', demo mode' : ''})`
);
await import(pathToFileURL(entry).href);
