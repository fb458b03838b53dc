import type { Kysely } from 'kysely';

// No foreign keys on purpose: the trail must outlive the workspace or user it mentions.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('audit_log')
		.addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
		.addColumn('workspace_id', 'text')
		.addColumn('actor_id', 'text')
		.addColumn('action', 'text', (c) => c.notNull())
		.addColumn('target', 'text')
		.addColumn('details', 'text', (c) => c.notNull().defaultTo('{}'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('audit_log_workspace_index')
		.on('audit_log')
		.columns(['workspace_id', 'created_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('audit_log').execute();
}
