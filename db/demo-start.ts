// Runs before the server starts: migrates the database and, in demo mode, seeds the demo scenario
// into an empty one (no users yet), never into a database people already use.
// `scripts/serve.js` runs this from the build (bundled by scripts/build-demo-start.ts); `npm run dev`
// runs it with tsx before `vite dev`. The server itself only migrates, so nothing in src imports
// the demo scenario.
import { pathToFileURL } from 'node:url';
import { loadConfig, startupProblem } from '../src/lib/server/config';
import { createDatabase, databasePathFromEnv } from '../src/lib/server/db/connection';
import { migrateToLatest } from '../src/lib/server/db/migrate';
import { storageFromEnv } from '../src/lib/server/storage/config';
import { countUsers, seedDemo } from './seed';

/** Why these settings cannot start a server (scripts/serve.js prints it and exits), or null. */
export function settingsProblem(env: NodeJS.ProcessEnv = process.env): string | null {
	try {
		return startupProblem(loadConfig(env));
	} catch (error) {
		return error instanceof Error ? error.message : String(error);
	}
}

/** Returns what was seeded (empty when nothing was). */
export async function demoStart(env: NodeJS.ProcessEnv = process.env): Promise<string[]> {
	const config = loadConfig(env);
	const path = databasePathFromEnv(env);
	const db = createDatabase(path);
	try {
		await migrateToLatest(db);
		if (!config.demoMode || (await countUsers(db)) > 0) return [];
		// The same storage and limit the server uses (src/lib/server/startup.ts).
		const storage = storageFromEnv(env, 4 * config.captureMaxBytes);
		const { created } = await seedDemo(db, { storage });
		console.log(`Demo data seeded into ${path}: ${created.length} items.`);
		return created;
	} finally {
		await db.destroy();
	}
}

// `tsx db/demo-start.ts [--dev]`: --dev counts as development (demo mode), as `vite dev` does.
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
	if (process.argv.includes('--dev')) process.env.NODE_ENV ||= 'development';
	try {
		await demoStart();
	} catch (error) {
		console.error(
			`Preparing the database failed: ${error instanceof Error ? error.message : String(error)}`
		);
		process.exitCode = 1;
	}
}
