import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { migrations } from '../../../../db/migrations/index';
import { createDatabase, migrateDown, migrateToLatest, type DB } from './index';

async function schemaDump(db: DB): Promise<string[]> {
	const { rows } = await sql<{ type: string; name: string; sql: string | null }>`
		select type, name, sql from sqlite_master
		where name not like 'sqlite_%' and name not like 'kysely_%' order by type, name`.execute(db);
	return rows.map((r) => `${r.type} ${r.name}: ${r.sql}`);
}

describe('migrations', () => {
	it('apply to an empty database and create every table', async () => {
		const db = createDatabase(':memory:');
		const { results } = await migrateToLatest(db);
		expect(results?.map((r) => [r.migrationName, r.status])).toEqual(
			Object.keys(migrations).map((name) => [name, 'Success'])
		);
		const tables = (await db.introspection.getTables()).map((t) => t.name).sort();
		expect(tables).toEqual(
			[
				'Account',
				'Session',
				'access_tokens',
				'User',
				'VerificationToken',
				'audit_log',
				'capture_decodes',
				'capture_views',
				'captures',
				'invitations',
				'mailbox_messages',
				'map_revisions',
				'maps',
				'memberships',
				'receiver_profile_revisions',
				'receiver_profiles',
				'receiver_synonyms',
				'share_links',
				'signin_requests',
				'workspaces'
			].sort()
		);
	});

	it('running them again changes nothing', async () => {
		const db = createDatabase(':memory:');
		await migrateToLatest(db);
		const before = await schemaDump(db);
		const { results } = await migrateToLatest(db);
		expect(results).toEqual([]);
		expect(await schemaDump(db)).toEqual(before);
	});

	it('can be undone one by one down to an empty database, then reapplied', async () => {
		const db = createDatabase(':memory:');
		await migrateToLatest(db);
		const full = await schemaDump(db);
		for (const name of Object.keys(migrations).reverse()) {
			const { results } = await migrateDown(db);
			expect(results?.[0]).toMatchObject({
				migrationName: name,
				direction: 'Down',
				status: 'Success'
			});
		}
		expect(await schemaDump(db)).toEqual([]);
		await migrateToLatest(db);
		expect(await schemaDump(db)).toEqual(full);
	});

	it('turns on foreign keys, so memberships cannot point at missing users', async () => {
		const db = createDatabase(':memory:');
		await migrateToLatest(db);
		await expect(
			db
				.insertInto('memberships')
				.values({
					workspace_id: 'nope',
					user_id: 'nobody',
					role: 'owner',
					joined_at: new Date().toISOString()
				})
				.execute()
		).rejects.toThrow(/FOREIGN KEY/);
	});
});
