/** Repository of workspace memberships; the last owner can never be demoted or removed. */
import type { MemberView, MembersOverview } from '../../api/workspaces';
import type { Role } from '../../roles';
import type { DB } from '../db/connection';
import type { Membership } from '../db/schema';
import { Problem } from '../problem';
import { appendAudit } from './audit';
import { listPendingInvitations } from './invitations';

export async function findMembership(
	db: DB,
	workspaceId: string,
	userId: string
): Promise<Membership | undefined> {
	return db
		.selectFrom('memberships')
		.selectAll()
		.where('workspace_id', '=', workspaceId)
		.where('user_id', '=', userId)
		.executeTakeFirst();
}

function memberQuery(db: DB, workspaceId: string) {
	return db
		.selectFrom('memberships')
		.innerJoin('User', 'User.id', 'memberships.user_id')
		.select([
			'memberships.user_id as userId',
			'User.email as email',
			'User.name as name',
			'memberships.role as role',
			'memberships.joined_at as joinedAt'
		])
		.where('memberships.workspace_id', '=', workspaceId);
}

async function memberView(db: DB, workspaceId: string, userId: string): Promise<MemberView> {
	return memberQuery(db, workspaceId)
		.where('memberships.user_id', '=', userId)
		.executeTakeFirstOrThrow();
}

export async function listMembers(db: DB, workspaceId: string): Promise<MemberView[]> {
	return memberQuery(db, workspaceId)
		.orderBy('memberships.joined_at')
		.orderBy('User.email')
		.execute();
}

/** The members page: everyone, and pending invitations for owners (who was invited is their business only). */
export async function membersOverview(
	db: DB,
	access: { workspaceId: string; userId: string; role: Role }
): Promise<MembersOverview> {
	return {
		members: await listMembers(db, access.workspaceId),
		invitations:
			access.role === 'owner' ? await listPendingInvitations(db, access.workspaceId) : [],
		myRole: access.role,
		myUserId: access.userId
	};
}

async function countOwners(db: DB, workspaceId: string): Promise<number> {
	const row = await db
		.selectFrom('memberships')
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.where('workspace_id', '=', workspaceId)
		.where('role', '=', 'owner')
		.executeTakeFirstOrThrow();
	return Number(row.n);
}

async function requireMember(db: DB, workspaceId: string, userId: string): Promise<Membership> {
	const membership = await findMembership(db, workspaceId, userId);
	if (!membership) throw new Problem(404, 'That person is not a member of this workspace.');
	return membership;
}

// A workspace without an owner could never manage its members again.
async function refuseIfLastOwner(db: DB, membership: Membership, message: string): Promise<void> {
	if (membership.role === 'owner' && (await countOwners(db, membership.workspace_id)) <= 1) {
		throw new Problem(409, message);
	}
}

/** Changes a member's role; answers the member as now and the role they had (for an undo). */
export async function changeMemberRole(
	db: DB,
	input: { workspaceId: string; userId: string; role: Role; actorId: string }
): Promise<{ member: MemberView; from: Role }> {
	return db.transaction().execute(async (trx) => {
		const membership = await requireMember(trx, input.workspaceId, input.userId);
		const from = membership.role;
		// Nothing changes, so nothing is recorded.
		if (from === input.role)
			return { member: await memberView(trx, input.workspaceId, input.userId), from };
		if (input.role !== 'owner') {
			await refuseIfLastOwner(
				trx,
				membership,
				'The last owner cannot be demoted. Make someone else an owner first.'
			);
		}
		await trx
			.updateTable('memberships')
			.set({ role: input.role })
			.where('workspace_id', '=', input.workspaceId)
			.where('user_id', '=', input.userId)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'member.role_change',
			target: input.userId,
			details: { from, to: input.role }
		});
		return { member: await memberView(trx, input.workspaceId, input.userId), from };
	});
}

/** Removes a member (when `userId === actorId` this is leaving); answers who it was. */
export async function removeMember(
	db: DB,
	input: { workspaceId: string; userId: string; actorId: string }
): Promise<MemberView> {
	return db.transaction().execute(async (trx) => {
		const membership = await requireMember(trx, input.workspaceId, input.userId);
		const member = await memberView(trx, input.workspaceId, input.userId);
		await refuseIfLastOwner(
			trx,
			membership,
			'The last owner cannot leave or be removed. Make someone else an owner first, or delete the workspace.'
		);
		await trx
			.deleteFrom('memberships')
			.where('workspace_id', '=', input.workspaceId)
			.where('user_id', '=', input.userId)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: input.userId === input.actorId ? 'member.leave' : 'member.remove',
			target: input.userId,
			details: { role: membership.role }
		});
		return member;
	});
}
