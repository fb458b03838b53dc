import { createDatabase, databasePathFromEnv, type DB } from './connection';
import { migrateToLatest } from './migrate';

export { createDatabase, databasePathFromEnv, type DB } from './connection';
export { migrateToLatest, migrateDown } from './migrate';
export type * from './schema';

// One connection for the whole server process (it holds no per-user state); opened and migrated on
// first use so the server, tsx scripts and the build's analysis step need no extra wiring.
let ready: Promise<DB> | undefined;

export function getDatabase(): Promise<DB> {
	ready ??= (async () => {
		const db = createDatabase(databasePathFromEnv());
		await migrateToLatest(db);
		return db;
	})();
	return ready;
}
