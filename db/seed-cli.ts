// `npm run db:seed` — adds the demo accounts and workspace to DATABASE_PATH (idempotent).
import { createDatabase, databasePathFromEnv } from '../src/lib/server/db/connection';
import { migrateToLatest } from '../src/lib/server/db/migrate';
import { seedDemo } from './seed';

const path = databasePathFromEnv();
const db = createDatabase(path);
try {
	await migrateToLatest(db);
	const { created } = await seedDemo(db);
	console.log(created.length ? `Seeded ${path}:\n  ${created.join('\n  ')}` : `${path} already holds the demo data.`);
} catch (error) {
	console.error(`Seeding ${path} failed: ${error instanceof Error ? error.message : String(error)}`);
	process.exitCode = 1;
} finally {
	await db.destroy();
}
