// `npm run db:migrate` — brings DATABASE_PATH (default data/framewright.db) to the latest schema.
import { createDatabase, databasePathFromEnv } from '../src/lib/server/db/connection';
import { migrateToLatest } from '../src/lib/server/db/migrate';

const path = databasePathFromEnv();
const db = createDatabase(path);
try {
	const { results = [] } = await migrateToLatest(db);
	for (const r of results)
		console.log(`${r.status === 'Success' ? 'applied' : r.status}: ${r.migrationName}`);
	console.log(results.length ? `${path} is up to date.` : `${path} was already up to date.`);
} catch (error) {
	console.error(error instanceof Error ? error.message : String(error));
	process.exitCode = 1;
} finally {
	await db.destroy();
}
