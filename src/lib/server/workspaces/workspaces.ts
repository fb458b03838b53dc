/** Repository of workspaces: create (the creator becomes owner), find, list, rename, delete. */
import type { WorkspaceSummary } from '../../api/workspaces';
import { roleAtLeast, type Role } from '../../roles';
import { slugPart } from '../../slug';
import type { DB } from '../db/connection';
import type { Workspace } from '../db/schema';
import { Problem } from '../problem';
import { appendAudit } from './audit';

/** URL-safe slug: lowercase ASCII letters, digits and single hyphens. */
function slugify(name: string): string {
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
): Promise<WorkspaceSummary> {
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
		return { id: workspace.id, slug: workspace.slug, name: workspace.name, role: 'owner' };
	});
}

export async function findWorkspaceBySlug(db: DB, slug: string): Promise<Workspace | undefined> {
	return db.selectFrom('workspaces').selectAll().where('slug', '=', slug).executeTakeFirst();
}

/**
 * The workspaces a person belongs to, with their role. With an access token's scope, only the
 * token's workspace, at the lower of the two roles (a token shows nothing of other workspaces).
 */
export async function listWorkspacesForUser(
	db: DB,
	userId: string,
	scope: { workspaceId: string; role: Role } | null = null
): Promise<WorkspaceSummary[]> {
	let query = db
		.selectFrom('workspaces')
		.innerJoin('memberships', 'memberships.workspace_id', 'workspaces.id')
		.select(['workspaces.id', 'workspaces.slug', 'workspaces.name', 'memberships.role'])
		.where('memberships.user_id', '=', userId);
	if (scope) query = query.where('workspaces.id', '=', scope.workspaceId);
	const rows = await query.orderBy('workspaces.name').execute();
	if (!scope) return rows;
	return rows.map((w) => ({ ...w, role: roleAtLeast(w.role, scope.role) ? scope.role : w.role }));
}

async function requireWorkspace(db: DB, workspaceId: string): Promise<Workspace> {
	const workspace = await db
		.selectFrom('workspaces')
		.selectAll()
		.where('id', '=', workspaceId)
		.executeTakeFirst();
	if (!workspace) throw new Problem(404, 'Workspace not found.');
	return workspace;
}

/** Renaming keeps the slug, so links people already shared keep working. */
export async function renameWorkspace(
	db: DB,
	input: { workspaceId: string; name: string; actorId: string }
): Promise<Omit<WorkspaceSummary, 'role'>> {
	return db.transaction().execute(async (trx) => {
		const before = await requireWorkspace(trx, input.workspaceId);
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
		return { id: before.id, slug: before.slug, name: input.name };
	});
}

export async function deleteWorkspace(
	db: DB,
	input: { workspaceId: string; actorId: string }
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const before = await requireWorkspace(trx, input.workspaceId);
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
