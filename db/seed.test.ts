import { describe, expect, it } from 'vitest';
import { createTestDatabase } from '../src/lib/server/test-support';
import { demoAccounts, demoWorkspace, seedDemo } from './seed';

describe('demo seed', () => {
	it('creates the invented team with one account per role, and is idempotent', async () => {
		const db = await createTestDatabase();
		const first = await seedDemo(db);
		expect(first.created).toHaveLength(9);
		const second = await seedDemo(db);
		expect(second.created).toEqual([]);
		const members = await db
			.selectFrom('memberships')
			.innerJoin('User', 'User.id', 'memberships.user_id')
			.innerJoin('workspaces', 'workspaces.id', 'memberships.workspace_id')
			.select(['User.email', 'memberships.role', 'workspaces.slug'])
			.orderBy('User.email')
			.execute();
		expect(members).toEqual(
			demoAccounts
				.map((a) => ({ email: a.email, role: a.role, slug: demoWorkspace.slug }))
				.sort((a, b) => a.email.localeCompare(b.email))
		);
		// The two demo maps: club racer r1 with an unpublished draft change, generator set r1.
		const maps = await db
			.selectFrom('maps')
			.select([
				'name',
				'draft_version',
				(eb) =>
					eb
						.selectFrom('map_revisions')
						.select((r) => r.fn.max('number').as('n'))
						.whereRef('map_revisions.map_id', '=', 'maps.id')
						.as('latest')
			])
			.orderBy('name')
			.execute();
		expect(maps).toEqual([
			{ name: 'Club racer engine controller', draft_version: 2, latest: 1 },
			{ name: 'Generator set engine (J1939)', draft_version: 1, latest: 1 }
		]);
		// Reserved test domain only (RFC 2606), never a real mailbox.
		expect(demoAccounts.every((a) => a.email.endsWith('@framewright.test'))).toBe(true);
	});
});
