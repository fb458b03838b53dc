import { sql, type Kysely } from 'kysely';

// Receiver profiles are versioned like maps: one editable draft (the profile JSON and its links,
// guarded by draft_version) and immutable published revisions. A profile's links point at one map
// revision (map_id + map_revision), so profiles linked to a map can be found when it publishes a
// newer one. A deleted map leaves its profiles and their revisions with the map's name only.
// A workspace may add its own synonyms to the built-in ones used when linking.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('receiver_profiles')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('kind', 'text', (c) => c.notNull())
		.addColumn('draft_json', 'text', (c) => c.notNull())
		.addColumn('links_json', 'text', (c) => c.notNull().defaultTo('[]'))
		.addColumn('map_id', 'text', (c) => c.references('maps.id').onDelete('set null'))
		.addColumn('map_revision', 'integer', (c) => c.check(sql`map_revision >= 1`))
		.addColumn('draft_version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('updated_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('updated_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('receiver_profiles_workspace_index')
		.on('receiver_profiles')
		.columns(['workspace_id', 'updated_at'])
		.execute();
	await db.schema
		.createIndex('receiver_profiles_map_index')
		.on('receiver_profiles')
		.column('map_id')
		.execute();

	await db.schema
		.createTable('receiver_profile_revisions')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('profile_id', 'text', (c) =>
			c.notNull().references('receiver_profiles.id').onDelete('cascade')
		)
		.addColumn('number', 'integer', (c) => c.notNull().check(sql`number >= 1`))
		.addColumn('note', 'text', (c) => c.notNull())
		.addColumn('profile_json', 'text', (c) => c.notNull())
		.addColumn('links_json', 'text', (c) => c.notNull())
		.addColumn('map_id', 'text', (c) => c.references('maps.id').onDelete('set null'))
		.addColumn('map_name', 'text')
		.addColumn('map_revision', 'integer')
		.addColumn('published_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('published_at', 'text', (c) => c.notNull())
		.addUniqueConstraint('receiver_profile_revisions_number_unique', ['profile_id', 'number'])
		.execute();

	await db.schema
		.createTable('receiver_synonyms')
		.addColumn('workspace_id', 'text', (c) =>
			c.primaryKey().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('synonyms_json', 'text', (c) => c.notNull())
		.addColumn('updated_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('updated_at', 'text', (c) => c.notNull())
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('receiver_synonyms').execute();
	await db.schema.dropTable('receiver_profile_revisions').execute();
	await db.schema.dropTable('receiver_profiles').execute();
}
