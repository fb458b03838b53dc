import { sql, type Kysely } from 'kysely';

// A capture is the uploaded CSV (raw_key) plus, once processed, its compact frame store (store_key)
// and the import report. Decodes record which map revision (or draft version) produced a view, so a
// decoded view stays reproducible; a deleted map leaves its decodes with the name only.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('captures')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('workspace_id', 'text', (c) =>
			c.notNull().references('workspaces.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('file_name', 'text', (c) => c.notNull())
		.addColumn('size_bytes', 'integer', (c) => c.notNull())
		.addColumn('uploaded_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('uploaded_at', 'text', (c) => c.notNull())
		.addColumn('status', 'text', (c) =>
			c.notNull().check(sqlIn('status', ['uploaded', 'processing', 'ready', 'failed']))
		)
		.addColumn('detected_json', 'text')
		.addColumn('layout_json', 'text')
		.addColumn('report_json', 'text')
		.addColumn('frame_count', 'integer')
		.addColumn('duration_s', 'real')
		.addColumn('raw_key', 'text', (c) => c.notNull())
		.addColumn('store_key', 'text')
		.addColumn('progress', 'real', (c) => c.notNull().defaultTo(0))
		.addColumn('error', 'text')
		.addColumn('processed_at', 'text')
		.execute();
	await db.schema
		.createIndex('captures_workspace_index')
		.on('captures')
		.columns(['workspace_id', 'uploaded_at'])
		.execute();

	await db.schema
		.createTable('capture_decodes')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('capture_id', 'text', (c) =>
			c.notNull().references('captures.id').onDelete('cascade')
		)
		.addColumn('map_id', 'text', (c) => c.references('maps.id').onDelete('set null'))
		.addColumn('map_name', 'text', (c) => c.notNull())
		.addColumn('revision', 'integer')
		.addColumn('draft_version', 'integer')
		.addColumn('decoded_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('decoded_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('capture_decodes_capture_index')
		.on('capture_decodes')
		.columns(['capture_id', 'decoded_at'])
		.execute();
}

/** `column IN ('a', 'b')` for a CHECK constraint (values are constants of this file, never input). */
function sqlIn(column: string, values: string[]) {
	return sql.raw(`${column} IN (${values.map((v) => `'${v}'`).join(', ')})`);
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('capture_decodes').execute();
	await db.schema.dropTable('captures').execute();
}
