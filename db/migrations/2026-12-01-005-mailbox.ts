import type { Kysely } from 'kysely';

// Messages caught by the demo's stand-in SMTP server; kept in the database so a restart keeps them
// and tests in another process can read them.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('mailbox_messages')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('to_address', 'text', (c) => c.notNull())
		.addColumn('from_address', 'text', (c) => c.notNull())
		.addColumn('subject', 'text', (c) => c.notNull())
		.addColumn('text', 'text', (c) => c.notNull())
		.addColumn('html', 'text')
		.addColumn('links', 'text', (c) => c.notNull().defaultTo('[]'))
		.addColumn('received_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('mailbox_messages_to_index')
		.on('mailbox_messages')
		.columns(['to_address', 'received_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('mailbox_messages').execute();
}
