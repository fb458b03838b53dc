import { Migrator, type Kysely, type MigrationResultSet } from 'kysely';
import { migrationProvider } from '../../../../db/migrations/index';

function migratorFor(db: Kysely<any>): Migrator {
	return new Migrator({ db, provider: migrationProvider });
}

function throwOnError({ error, results }: MigrationResultSet): MigrationResultSet {
	if (error) {
		const failed = results?.find((r) => r.status === 'Error')?.migrationName ?? 'unknown';
		throw new Error(`Database migration "${failed}" failed: ${String(error)}`, { cause: error });
	}
	return { error, results };
}

export async function migrateToLatest(db: Kysely<any>): Promise<MigrationResultSet> {
	return throwOnError(await migratorFor(db).migrateToLatest());
}

/** Undoes the newest applied migration (used by tests and by hand when rolling back). */
export async function migrateDown(db: Kysely<any>): Promise<MigrationResultSet> {
	return throwOnError(await migratorFor(db).migrateDown());
}
