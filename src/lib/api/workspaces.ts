/**
 * The workspace API's contract (`/api/workspaces/…`: workspaces, members, invitations). The same
 * schemas check the plain forms (form actions) that send these fields.
 */
import { z } from 'zod';
import { roleSchema } from '../roles';
import { timestampSchema } from './shapes';

// ---- requests ----

export const workspaceNameSchema = z
	.string({ error: 'Give the workspace a name.' })
	.trim()
	.min(2, 'Use at least 2 characters.')
	.max(80, 'Use at most 80 characters.');

export const emailSchema = z
	.string({ error: 'Enter an e-mail address.' })
	.trim()
	.toLowerCase()
	.pipe(z.email('Enter a valid e-mail address.').max(254, 'That address is too long.'));

export const workspaceInputSchema = z.strictObject({ name: workspaceNameSchema });
export const invitationInputSchema = z.strictObject({ email: emailSchema, role: roleSchema });
export const roleChangeSchema = z.strictObject({ role: roleSchema });

// The JSON routes name a member or an invitation in their path; the members page's forms send it.
const idField = z.string({ error: 'Say which one.' }).min(1, 'Say which one.');
export const memberRefSchema = z.strictObject({ userId: idField });
export const invitationRefSchema = z.strictObject({ id: idField });
export const memberRoleFormSchema = roleChangeSchema.extend({ userId: idField });

/** A day as a date field sends it; a filter's range runs from the start of one to the end of the other (UTC). */
const dayField = z.iso.date({ error: 'A date like 2026-12-02.' });
const entryId = z.coerce.number().int().positive();

/**
 * The audit log page's query (a plain GET form): who, what kind (`map` or `map.publish`), which
 * days, and the page: entries older than `before`, or newer than `after` (keyset on the entry id).
 */
export const auditQuerySchema = z
	.object({
		person: z.string().min(1).optional(),
		kind: z
			.string()
			.regex(/^[a-z_]+(\.[a-z_]+)*$/, 'Choose a kind from the list.')
			.optional(),
		from: dayField.optional(),
		to: dayField.optional(),
		before: entryId.optional(),
		after: entryId.optional()
	})
	.refine((q) => !q.from || !q.to || q.from <= q.to, {
		path: ['to'],
		message: 'The last day comes before the first.'
	});
export type AuditQuery = z.output<typeof auditQuerySchema>;

// ---- answers ----

/** A workspace and the caller's role in it. */
export const workspaceSummarySchema = z.object({
	id: z.string(),
	slug: z.string(),
	name: z.string(),
	role: roleSchema
});
export type WorkspaceSummary = z.infer<typeof workspaceSummarySchema>;

export const workspaceListResponseSchema = z.object({
	workspaces: z.array(workspaceSummarySchema)
});
export type WorkspaceListResponse = z.infer<typeof workspaceListResponseSchema>;

export const createdWorkspaceResponseSchema = z.object({ workspace: workspaceSummarySchema });
export type CreatedWorkspaceResponse = z.infer<typeof createdWorkspaceResponseSchema>;

export const renamedWorkspaceResponseSchema = z.object({
	workspace: workspaceSummarySchema.omit({ role: true })
});
export type RenamedWorkspaceResponse = z.infer<typeof renamedWorkspaceResponseSchema>;

export const memberViewSchema = z.object({
	userId: z.string(),
	email: z.string(),
	name: z.string().nullable(),
	role: roleSchema,
	joinedAt: timestampSchema
});
export type MemberView = z.infer<typeof memberViewSchema>;

export const invitationViewSchema = z.object({
	id: z.string(),
	email: z.string(),
	role: roleSchema,
	expiresAt: timestampSchema,
	/** The inviter's e-mail address (null once that account is gone). */
	invitedBy: z.string().nullable()
});
export type InvitationView = z.infer<typeof invitationViewSchema>;

/** The members page: everyone, pending invitations (owners only; empty for others) and who is asking. */
export const membersOverviewSchema = z.object({
	members: z.array(memberViewSchema),
	invitations: z.array(invitationViewSchema),
	myRole: roleSchema,
	myUserId: z.string()
});
export type MembersOverview = z.infer<typeof membersOverviewSchema>;

export const memberResponseSchema = z.object({ member: memberViewSchema });
export type MemberResponse = z.infer<typeof memberResponseSchema>;

export const invitationResponseSchema = z.object({ invitation: invitationViewSchema });
export type InvitationResponse = z.infer<typeof invitationResponseSchema>;
