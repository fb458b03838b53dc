import { Problem } from '../problem';
import type { Role } from '../roles';
import { appendAudit } from './audit';
import type { DB } from './connection';
import type { Workspace } from './schema';
import { slugPart } from '../../slug';

export interface WorkspaceSummary {
	id: string;
	slug: string;
	name: string;
	role: Role;
}

/** URL-safe slug: lowercase ASCII letters, digits and single hyphens. */
export function slugify(name: string): string {
	return slugPart(name, 'workspace');
}

async function uniqueSlug(db: DB, name: string): Promise<string> {
	const base = slugify(name);
	const taken = new Set(
		(
			await db
				.selectFrom('workspaces')
				.select('slug')
				.where((eb) => eb.or([eb('slug', '=', base), eb('slug', 'like', `${base}-%`)]))
				.execute()
		).map((r) => r.slug)
	);
	let slug = base;
	for (let n = 2; taken.has(slug); n++) slug = `${base}-${n}`;
	return slug;
}

export async function createWorkspace(
	db: DB,
	input: { name: string; ownerId: string }
): Promise<Workspace> {
	return db.transaction().execute(async (trx) => {
		const now = new Date().toISOString();
		const workspace: Workspace = {
			id: crypto.randomUUID(),
			slug: await uniqueSlug(trx, input.name),
			name: input.name,
			created_by: input.ownerId,
			created_at: now
		};
		await trx.insertInto('workspaces').values(workspace).execute();
		await trx
			.insertInto('memberships')
			.values({ workspace_id: workspace.id, user_id: input.ownerId, role: 'owner', joined_at: now })
			.execute();
		await appendAudit(trx, {
			workspaceId: workspace.id,
			actorId: input.ownerId,
			action: 'workspace.create',
			target: workspace.slug,
			details: { name: workspace.name }
		});
		return workspace;
	});
}

export async function findWorkspaceBySlug(db: DB, slug: string): Promise<Workspace | undefined> {
	return db.selectFrom('workspaces').selectAll().where('slug', '=', slug).executeTakeFirst();
}

export async function listWorkspacesForUser(db: DB, userId: string): Promise<WorkspaceSummary[]> {
	return db
		.selectFrom('workspaces')
		.innerJoin('memberships', 'memberships.workspace_id', 'workspaces.id')
		.select(['workspaces.id', 'workspaces.slug', 'workspaces.name', 'memberships.role'])
		.where('memberships.user_id', '=', userId)
		.orderBy('workspaces.name')
		.execute();
}

/** Renaming keeps the slug, so links people already shared keep working. */
export async function renameWorkspace(
	db: DB,
	input: { workspaceId: string; name: string; actorId: string }
): Promise<Workspace> {
	return db.transaction().execute(async (trx) => {
		const before = await trx
			.selectFrom('workspaces')
			.selectAll()
			.where('id', '=', input.workspaceId)
			.executeTakeFirst();
		if (!before) throw new Problem(404, 'Workspace not found.');
		await trx
			.updateTable('workspaces')
			.set({ name: input.name })
			.where('id', '=', input.workspaceId)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'workspace.rename',
			target: before.slug,
			details: { from: before.name, to: input.name }
		});
		return { ...before, name: input.name };
	});
}

export async function deleteWorkspace(
	db: DB,
	input: { workspaceId: string; actorId: string }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const before = await trx
			.selectFrom('workspaces')
			.selectAll()
			.where('id', '=', input.workspaceId)
			.executeTakeFirst();
		if (!before) throw new Problem(404, 'Workspace not found.');
		// Memberships and invitations go with it (ON DELETE CASCADE); the audit trail stays.
		await trx.deleteFrom('workspaces').where('id', '=', input.workspaceId).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'workspace.delete',
			target: before.slug,
			details: { name: before.name }
		});
	});
}
