import type { Kysely } from 'kysely';

// Each capture's own bus bit rate (bit/s) for bus load and frame timing, and the data-phase bit rate
// of CAN FD captures. Null until guessed: the first decode fills it from its map and names that map
// in `bitrate_guess`; a person's edit clears the guess (docs/capture-csv.md, "Bit rate").
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('captures').addColumn('bitrate', 'integer').execute();
	await db.schema.alterTable('captures').addColumn('data_bitrate', 'integer').execute();
	await db.schema.alterTable('captures').addColumn('bitrate_guess', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('captures').dropColumn('bitrate_guess').execute();
	await db.schema.alterTable('captures').dropColumn('data_bitrate').execute();
	await db.schema.alterTable('captures').dropColumn('bitrate').execute();
}
