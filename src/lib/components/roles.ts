/** Workspace roles as the UI names and explains them (docs/architecture.md, "Auth, roles and the one guard"). */
// The type comes from the server's zod enum (type-only import: erased, so nothing server-side ships).
import type { Role } from '$lib/server/roles';
export type { Role };

/** Most to least privileged, the order the role pickers list them. */
export const ROLES = ['owner', 'editor', 'viewer'] as const satisfies readonly Role[];

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

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}
