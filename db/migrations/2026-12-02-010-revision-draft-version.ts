import { sql, type Kysely } from 'kysely';

// Each revision remembers the draft version it was published from, so publishing the same draft
// version twice is refused (one unique index per map). Existing revisions take their version from
// the audit entry of their publish; where two were published from one version, the later one
// keeps none, so the index holds.
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('map_revisions').addColumn('draft_version', 'integer').execute();
	await sql`
		update map_revisions set draft_version = (
			select cast(json_extract(a.details, '$.version') as integer) from audit_log a
			where a.action = 'map.publish' and a.target = map_revisions.map_id
				and json_extract(a.details, '$.revision') = map_revisions.number
			limit 1)`.execute(db);
	await sql`
		update map_revisions set draft_version = null
		where exists (
			select 1 from map_revisions earlier
			where earlier.map_id = map_revisions.map_id
				and earlier.draft_version = map_revisions.draft_version
				and earlier.number < map_revisions.number)`.execute(db);
	await db.schema
		.createIndex('map_revisions_draft_version_unique')
		.on('map_revisions')
		.columns(['map_id', 'draft_version'])
		.unique()
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropIndex('map_revisions_draft_version_unique').execute();
	await db.schema.alterTable('map_revisions').dropColumn('draft_version').execute();
}
