import { sql, type Kysely } from 'kysely';

// Maps hold one editable draft (JSON text, guarded by draft_version for optimistic concurrency);
// revisions are immutable published snapshots; share links point at one revision by a hashed token.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('maps')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('draft_json', 'text', (c) => c.notNull())
		.addColumn('draft_version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('updated_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('updated_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('maps_workspace_index')
		.on('maps')
		.columns(['workspace_id', 'updated_at'])
		.execute();

	await db.schema
		.createTable('map_revisions')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('map_id', 'text', (c) => c.notNull().references('maps.id').onDelete('cascade'))
		.addColumn('number', 'integer', (c) => c.notNull().check(sql`number >= 1`))
		.addColumn('note', 'text', (c) => c.notNull())
		.addColumn('map_json', 'text', (c) => c.notNull())
		.addColumn('published_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('published_at', 'text', (c) => c.notNull())
		.addUniqueConstraint('map_revisions_number_unique', ['map_id', 'number'])
		.execute();

	// Only a hash of the token is stored, so a leaked database cannot be used to open shared maps.
	await db.schema
		.createTable('share_links')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('map_id', 'text', (c) => c.notNull().references('maps.id').onDelete('cascade'))
		.addColumn('revision_id', 'text', (c) =>
			c.notNull().references('map_revisions.id').onDelete('cascade')
		)
		.addColumn('token_hash', 'text', (c) => c.notNull().unique())
		.addColumn('created_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('expires_at', 'text')
		.addColumn('revoked_at', 'text')
		.execute();
	await db.schema.createIndex('share_links_map_index').on('share_links').column('map_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('share_links').execute();
	await db.schema.dropTable('map_revisions').execute();
	await db.schema.dropTable('maps').execute();
}
