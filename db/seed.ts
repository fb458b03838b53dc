import type { Kysely } from 'kysely';
import type { Database } from '../src/lib/server/db/schema';
import type { Role } from '../src/lib/server/roles';
import { appendAudit } from '../src/lib/server/db/audit';

// An invented scenario for demos: a small club motorsport team. Addresses use the reserved `.test`
// top-level domain (RFC 2606), so no real mailbox can ever receive them.
export const demoWorkspace = { slug: 'quillmoor-club-racing', name: 'Quillmoor Club Racing' } as const;

export const demoAccounts: { email: string; name: string; role: Role }[] = [
	{ email: 'owner@framewright.test', name: 'Team owner (demo)', role: 'owner' },
	{ email: 'calibrator@framewright.test', name: 'Calibrator (demo)', role: 'editor' },
	{ email: 'tuner@framewright.test', name: 'Tuner (demo)', role: 'viewer' }
];

export async function countUsers(db: Kysely<Database>): Promise<number> {
	const { n } = await db
		.selectFrom('User')
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.executeTakeFirstOrThrow();
	return Number(n);
}

/** Adds whatever part of the demo data is missing; running it again changes nothing. */
export async function seedDemo(db: Kysely<Database>): Promise<{ created: string[] }> {
	return db.transaction().execute(async (trx) => {
		const created: string[] = [];
		const now = new Date().toISOString();
		const userIds = new Map<string, string>();
		for (const account of demoAccounts) {
			const existing = await trx.selectFrom('User').select('id').where('email', '=', account.email).executeTakeFirst();
			if (existing) {
				userIds.set(account.email, existing.id);
				continue;
			}
			const id = crypto.randomUUID();
			await trx
				.insertInto('User')
				.values({ id, email: account.email, name: account.name, emailVerified: null, image: null })
				.execute();
			userIds.set(account.email, id);
			created.push(`user ${account.email}`);
		}

		let workspace = await trx.selectFrom('workspaces').select('id').where('slug', '=', demoWorkspace.slug).executeTakeFirst();
		if (!workspace) {
			workspace = { id: crypto.randomUUID() };
			await trx
				.insertInto('workspaces')
				.values({ id: workspace.id, ...demoWorkspace, created_by: userIds.get(demoAccounts[0].email) ?? null, created_at: now })
				.execute();
			created.push(`workspace ${demoWorkspace.slug}`);
		}

		for (const account of demoAccounts) {
			const result = await trx
				.insertInto('memberships')
				.values({ workspace_id: workspace.id, user_id: userIds.get(account.email)!, role: account.role, joined_at: now })
				.onConflict((oc) => oc.columns(['workspace_id', 'user_id']).doNothing())
				.executeTakeFirst();
			if (Number(result.numInsertedOrUpdatedRows ?? 0) > 0) created.push(`membership ${account.email} (${account.role})`);
		}

		if (created.length > 0) {
			await appendAudit(trx, {
				workspaceId: workspace.id,
				actorId: null,
				action: 'demo.seed',
				target: demoWorkspace.slug,
				details: { created }
			});
		}
		return { created };
	});
}
