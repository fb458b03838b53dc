import type { Kysely } from 'kysely';

// A decode of one chosen bus of a capture of several: the bus index (into the capture's bus names),
// null for a decode of every bus (docs/capture-csv.md, "Several buses").
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('capture_decodes').addColumn('bus', 'integer').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('capture_decodes').dropColumn('bus').execute();
}
