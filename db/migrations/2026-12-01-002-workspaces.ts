import { sql, type Kysely } from 'kysely';

export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('workspaces')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('slug', 'text', (c) => c.notNull().unique())
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('created_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.execute();

	await db.schema
		.createTable('memberships')
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('owner', 'editor', 'viewer')`))
		.addColumn('joined_at', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('memberships_pk', ['workspace_id', 'user_id'])
		.execute();
	await db.schema
		.createIndex('memberships_user_index')
		.on('memberships')
		.column('user_id')
		.execute();

	// Only a hash of the token is stored, so a leaked database cannot be used to accept invitations.
	await db.schema
		.createTable('invitations')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('email', 'text', (c) => c.notNull())
		.addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('owner', 'editor', 'viewer')`))
		.addColumn('token_hash', 'text', (c) => c.notNull().unique())
		.addColumn('invited_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('accepted_at', 'text')
		.addColumn('accepted_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.execute();
	await db.schema
		.createIndex('invitations_workspace_index')
		.on('invitations')
		.column('workspace_id')
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('invitations').execute();
	await db.schema.dropTable('memberships').execute();
	await db.schema.dropTable('workspaces').execute();
}
