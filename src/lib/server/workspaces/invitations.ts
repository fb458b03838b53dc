/**
 * Invitations to a workspace: created by an owner and sent by e-mail, accepted once by the invited
 * address. The token travels only in the e-mail; the database keeps its hash.
 */
import { createHash, randomBytes } from 'node:crypto';
import type { InvitationResponse, InvitationView } from '../../api/workspaces';
import { invitationPath } from '../../api/paths';
import type { Role } from '../../roles';
import type { DB } from '../db/connection';
import type { Invitation } from '../db/schema';
import type { WorkspaceAccess } from '../access';
import { takeMailAllowance, tooManyMails } from '../mail/limits';
import { invitationMail } from '../mail/templates';
import { Problem } from '../problem';
import type { Services } from '../services';
import { appendAudit } from './audit';

function hashInvitationToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

export async function listPendingInvitations(
	db: DB,
	workspaceId: string,
	now = new Date()
): Promise<InvitationView[]> {
	return db
		.selectFrom('invitations')
		.leftJoin('User', 'User.id', 'invitations.invited_by')
		.select([
			'invitations.id as id',
			'invitations.email as email',
			'invitations.role as role',
			'invitations.expires_at as expiresAt',
			'User.email as invitedBy'
		])
		.where('invitations.workspace_id', '=', workspaceId)
		.where('invitations.accepted_at', 'is', null)
		.where('invitations.expires_at', '>', now.toISOString())
		.orderBy('invitations.created_at', 'desc')
		.execute();
}

/**
 * Creates an invitation and returns the raw token (only its hash is stored). A new invitation to the
 * same address replaces a pending one, so the latest e-mail is the only working link.
 */
export async function createInvitation(
	db: DB,
	input: {
		workspaceId: string;
		email: string;
		role: Role;
		invitedBy: string;
		maxAgeMs: number;
		now?: Date;
	}
): Promise<{ invitation: InvitationView; token: string }> {
	const now = input.now ?? new Date();
	const email = input.email.trim().toLowerCase();
	return db.transaction().execute(async (trx) => {
		const alreadyMember = await trx
			.selectFrom('memberships')
			.innerJoin('User', 'User.id', 'memberships.user_id')
			.select('memberships.user_id')
			.where('memberships.workspace_id', '=', input.workspaceId)
			.where('User.email', '=', email)
			.executeTakeFirst();
		if (alreadyMember) throw new Problem(409, `${email} is already a member of this workspace.`);

		await trx
			.deleteFrom('invitations')
			.where('workspace_id', '=', input.workspaceId)
			.where('email', '=', email)
			.where('accepted_at', 'is', null)
			.execute();
		const token = randomBytes(32).toString('base64url');
		const row: Invitation = {
			id: crypto.randomUUID(),
			workspace_id: input.workspaceId,
			email,
			role: input.role,
			token_hash: hashInvitationToken(token),
			invited_by: input.invitedBy,
			created_at: now.toISOString(),
			expires_at: new Date(now.getTime() + input.maxAgeMs).toISOString(),
			accepted_at: null,
			accepted_by: null
		};
		await trx.insertInto('invitations').values(row).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.invitedBy,
			action: 'invitation.create',
			target: email,
			details: { role: input.role, expiresAt: row.expires_at }
		});
		const inviter = await trx
			.selectFrom('User')
			.select('email')
			.where('id', '=', input.invitedBy)
			.executeTakeFirst();
		return {
			token,
			invitation: {
				id: row.id,
				email,
				role: row.role,
				expiresAt: row.expires_at,
				invitedBy: inviter?.email ?? null
			}
		};
	});
}

/**
 * Invites an address to the caller's workspace and e-mails it the link. Each account and each
 * client address may send only so many invitations an hour (429 past that, nothing stored).
 */
export async function inviteByEmail(
	services: Pick<Services, 'db' | 'config' | 'sendMail' | 'mailLimits'>,
	access: Pick<WorkspaceAccess, 'user' | 'workspace'>,
	input: { email: string; role: Role; origin: string; clientAddress: string }
): Promise<InvitationResponse> {
	const { user, workspace } = access;
	const wait = await takeMailAllowance([
		[services.mailLimits.invitationsByAccount, user.id],
		[services.mailLimits.invitationsByClient, input.clientAddress]
	]);
	if (wait !== null) throw tooManyMails('invitations sent', wait);
	const { invitation, token } = await createInvitation(services.db, {
		workspaceId: workspace.id,
		email: input.email,
		role: input.role,
		invitedBy: user.id,
		maxAgeMs: services.config.invitationMaxAgeMs
	});
	await services.sendMail(
		invitationMail({
			to: input.email,
			url: new URL(invitationPath(token), input.origin).toString(),
			workspaceName: workspace.name,
			role: input.role,
			invitedBy: user.name ?? user.email,
			expires: new Date(invitation.expiresAt)
		})
	);
	return { invitation };
}

/** Deletes a pending invitation (its link stops working); answers the address it was for. */
export async function revokeInvitation(
	db: DB,
	input: { workspaceId: string; id: string; actorId: string }
): Promise<{ email: string }> {
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.selectFrom('invitations')
			.selectAll()
			.where('id', '=', input.id)
			.where('workspace_id', '=', input.workspaceId)
			.where('accepted_at', 'is', null)
			.executeTakeFirst();
		if (!row) throw new Problem(404, 'No pending invitation with that id in this workspace.');
		await trx.deleteFrom('invitations').where('id', '=', row.id).execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'invitation.revoke',
			target: row.email,
			details: { role: row.role }
		});
		return { email: row.email };
	});
}

export interface InvitationLookup {
	invitation: Invitation;
	workspace: { id: string; slug: string; name: string };
}

export async function findInvitationByToken(
	db: DB,
	token: string
): Promise<InvitationLookup | undefined> {
	const row = await db
		.selectFrom('invitations')
		.innerJoin('workspaces', 'workspaces.id', 'invitations.workspace_id')
		.selectAll('invitations')
		.select(['workspaces.slug as workspaceSlug', 'workspaces.name as workspaceName'])
		.where('invitations.token_hash', '=', hashInvitationToken(token))
		.executeTakeFirst();
	if (!row) return undefined;
	const { workspaceSlug, workspaceName, ...invitation } = row;
	return {
		invitation,
		workspace: { id: invitation.workspace_id, slug: workspaceSlug, name: workspaceName }
	};
}

/** Why an invitation can no longer be accepted, or null while it is usable. */
export function invitationProblem(
	invitation: Invitation | undefined,
	now = new Date()
): Problem | null {
	if (!invitation)
		return new Problem(
			404,
			'This invitation link is not valid. Ask the workspace owner for a new one.'
		);
	if (invitation.accepted_at) return new Problem(410, 'This invitation has already been used.');
	if (invitation.expires_at <= now.toISOString()) {
		return new Problem(
			410,
			'This invitation has expired. Ask the workspace owner to send a new one.'
		);
	}
	return null;
}

/** What the invitation page shows: the invitation, or why its link no longer works. */
export async function invitationPageView(
	db: DB,
	token: string
): Promise<
	| {
			invitation: { workspaceName: string; email: string; role: Role; expiresAt: string };
			error: null;
	  }
	| { invitation: null; error: string }
> {
	const found = await findInvitationByToken(db, token);
	const problem = invitationProblem(found?.invitation);
	if (problem || !found)
		return { invitation: null, error: problem?.message ?? 'This invitation link is not valid.' };
	const { invitation, workspace } = found;
	return {
		invitation: {
			workspaceName: workspace.name,
			email: invitation.email,
			role: invitation.role,
			expiresAt: invitation.expires_at
		},
		error: null
	};
}

/** Accepts an invitation for the signed-in user; returns the workspace slug to go to. */
export async function acceptInvitation(
	db: DB,
	input: { token: string; user: { id: string; email: string }; now?: Date }
): Promise<{ slug: string }> {
	const now = input.now ?? new Date();
	return db.transaction().execute(async (trx) => {
		const found = await findInvitationByToken(trx, input.token);
		const problem = invitationProblem(found?.invitation, now);
		if (problem || !found) throw problem;
		const { invitation, workspace } = found;
		if (invitation.email !== input.user.email.trim().toLowerCase()) {
			throw new Problem(
				403,
				`This invitation was sent to ${invitation.email}. Sign in with that address to accept it.`
			);
		}
		// Marking it accepted first makes a second use fail even if two requests race.
		const marked = await trx
			.updateTable('invitations')
			.set({ accepted_at: now.toISOString(), accepted_by: input.user.id })
			.where('id', '=', invitation.id)
			.where('accepted_at', 'is', null)
			.executeTakeFirst();
		if (Number(marked.numUpdatedRows) !== 1)
			throw new Problem(410, 'This invitation has already been used.');
		// Someone who is already a member keeps their current role.
		await trx
			.insertInto('memberships')
			.values({
				workspace_id: workspace.id,
				user_id: input.user.id,
				role: invitation.role,
				joined_at: now.toISOString()
			})
			.onConflict((oc) => oc.columns(['workspace_id', 'user_id']).doNothing())
			.execute();
		await appendAudit(trx, {
			workspaceId: workspace.id,
			actorId: input.user.id,
			action: 'invitation.accept',
			target: invitation.email,
			details: { role: invitation.role }
		});
		return { slug: workspace.slug };
	});
}
