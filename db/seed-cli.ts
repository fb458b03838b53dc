// `npm run db:seed` — adds the demo accounts and workspace to DATABASE_PATH (idempotent).
import { createDatabase, databasePathFromEnv } from '../src/lib/server/db/connection';
import { migrateToLatest } from '../src/lib/server/db/migrate';
import { loadConfig } from '../src/lib/server/config';
import { storageFromEnv } from '../src/lib/server/storage/config';
import { seedDemo } from './seed';

const path = databasePathFromEnv();
const db = createDatabase(path);
try {
	await migrateToLatest(db);
	const storage = storageFromEnv(process.env, 4 * loadConfig().captureMaxBytes);
	const { created } = await seedDemo(db, { storage });
	console.log(
		created.length
			? `Seeded ${path}:\n  ${created.join('\n  ')}`
			: `${path} already holds the demo data.`
	);
} catch (error) {
	console.error(
		`Seeding ${path} failed: ${error instanceof Error ? error.message : String(error)}`
	);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
