/**
 * The few SQL expressions SQLite and PostgreSQL spell differently, chosen by the connection's
 * dialect so domain modules stay one Kysely code path (docs/scale-out.md).
 */
import { PostgresAdapter, sql, type RawBuilder } from 'kysely';
import type { DB } from './connection';

export const isPostgres = (db: DB) => db.getExecutor().adapter instanceof PostgresAdapter;

/** Length of the JSON array under `key` of a text column holding a JSON object. */
export function jsonArrayLength(db: DB, column: string, key: string): RawBuilder<number> {
	return isPostgres(db)
		? sql<number>`json_array_length((${sql.ref(column)})::json -> ${key})`
		: sql<number>`json_array_length(${sql.ref(column)}, ${'$.' + key})`;
}
