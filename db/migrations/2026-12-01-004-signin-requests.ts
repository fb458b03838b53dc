import type { Kysely } from 'kysely';

// One row per sign-in link asked for, so the per-address hourly limit survives restarts.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('signin_requests')
		.addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
		.addColumn('email', 'text', (c) => c.notNull())
		.addColumn('requested_at', 'integer', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('signin_requests_email_index')
		.on('signin_requests')
		.columns(['email', 'requested_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('signin_requests').execute();
}
