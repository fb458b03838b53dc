/**
 * Workspace roles: the one definition the guard, the API contract and the UI share. Pure (no
 * server or browser code), so both sides import it.
 */
import { z } from 'zod';

/** Most to least privileged, the order the role pickers list them. */
export const roleSchema = z.enum(['owner', 'editor', 'viewer']);
export type Role = z.infer<typeof roleSchema>;

export const ROLES = roleSchema.options;

// Each role can do everything the roles below it can.
const rank: Record<Role, number> = { viewer: 1, editor: 2, owner: 3 };

export function roleAtLeast(role: Role, minimum: Role): boolean {
	return rank[role] >= rank[minimum];
}

/**
 * The roles an access token can carry: read-only (viewer) or edit (editor). What only an owner may do
 * (members, deleting) needs the person, signed in.
 */
export const tokenRoleSchema = z.enum(['viewer', 'editor']);
export type TokenRole = z.infer<typeof tokenRoleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	editor: 'Editor',
	viewer: 'Viewer'
};

export const ROLE_HINTS: Record<Role, string> = {
	owner: 'manages members and invitations, edits and deletes',
	editor: 'edits drafts, publishes revisions, manages alert rules',
	viewer: 'reads maps and revisions, uploads captures, decodes, exports'
};
