import type { Kysely } from 'kysely';

// Access tokens: personal, one workspace each, a role no higher than viewer or editor. Only a hash
// of the secret part is stored; the id part is public and finds the row. Audit rows name the token
// a change was made with (null for a signed-in session).
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('access_tokens')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('role', 'text', (c) => c.notNull())
		.addColumn('secret_hash', 'text', (c) => c.notNull())
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('last_used_at', 'text')
		.addColumn('revoked_at', 'text')
		.execute();
	await db.schema
		.createIndex('access_tokens_owner_index')
		.on('access_tokens')
		.columns(['workspace_id', 'user_id'])
		.execute();
	await db.schema.alterTable('audit_log').addColumn('token_id', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('audit_log').dropColumn('token_id').execute();
	await db.schema.dropTable('access_tokens').execute();
}
