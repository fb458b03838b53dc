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
		// Reserved test domain only (RFC 2606), never a real mailbox.
		expect(demoAccounts.every((a) => a.email.endsWith('@framewright.test'))).toBe(true);
	});
});
