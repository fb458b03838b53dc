import type { Kysely } from 'kysely';

// Saved views of a capture's workbench: a name and the view state as JSON (panels, plotted
// channels, time window, derived channels). Anyone who may read the capture may save their own;
// a view goes with its capture, and stays (unattributed) when its author's account is deleted.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('capture_views')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('capture_id', 'text', (c) =>
			c.notNull().references('captures.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('state_json', 'text', (c) => c.notNull())
		.addColumn('saved_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('saved_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('capture_views_capture_index')
		.on('capture_views')
		.columns(['capture_id', 'name'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('capture_views').execute();
}
