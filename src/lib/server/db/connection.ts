import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import SQLite from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import type { Database } from './schema';

export type DB = Kysely<Database>;

/** Opens (creating if needed) a SQLite database; `':memory:'` gives a private in-memory one. */
export function createDatabase(path: string): DB {
	if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true });
	const sqlite = new SQLite(path);
	// WAL lets readers and the writer work at once; busy_timeout waits instead of failing on a lock;
	// SQLite leaves foreign keys off unless asked on every connection.
	sqlite.pragma('journal_mode = WAL');
	sqlite.pragma('busy_timeout = 5000');
	sqlite.pragma('foreign_keys = ON');
	return new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
}

export function databasePathFromEnv(env: NodeJS.ProcessEnv = process.env): string {
	return env.DATABASE_PATH || 'data/framewright.db';
}
