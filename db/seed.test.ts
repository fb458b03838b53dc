import { describe, expect, it } from 'vitest';
import { createTestDatabase } from '../src/lib/server/test-support';
import { demoAccounts, demoWorkspace, seedDemo } from './seed';

describe('demo seed', () => {
	it('creates the invented team with one account per role, and is idempotent', async () => {
		const db = await createTestDatabase();
		const first = await seedDemo(db);
		expect(first.created).toHaveLength(11);
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
		// The two demo receivers, linked to r1 of their maps and published: automatic links, the one
		// link the dash profile makes by hand, unit conversions and the λ → AFR rule among them.
		const profiles = await db
			.selectFrom('receiver_profiles')
			.innerJoin('maps', 'maps.id', 'receiver_profiles.map_id')
			.select([
				'receiver_profiles.name as name',
				'receiver_profiles.links_json as links',
				'receiver_profiles.map_revision as revision',
				'maps.name as map'
			])
			.orderBy('receiver_profiles.name')
			.execute();
		expect(profiles.map((p) => [p.name, p.map, p.revision])).toEqual([
			['Club dash display', 'Club racer engine controller', 1],
			['Generator set panel', 'Generator set engine (J1939)', 1]
		]);
		const links = profiles.flatMap(
			(p) =>
				JSON.parse(p.links) as {
					wanted: string;
					manual: boolean;
					conversion: { kind: string; from: string; to: string };
				}[]
		);
		expect(links.filter((l) => l.manual).map((l) => l.wanted)).toEqual(['Det count']);
		const kinds = (kind: string) =>
			links
				.filter((l) => l.conversion.kind === kind)
				.map((l) => `${l.conversion.from}→${l.conversion.to}`);
		expect(kinds('mixture')).toEqual(['λ→AFR']);
		expect(kinds('units')).toContain('kPa→bar');
		// Reserved test domain only (RFC 2606), never a real mailbox.
		expect(demoAccounts.every((a) => a.email.endsWith('@framewright.test'))).toBe(true);
	});
});
