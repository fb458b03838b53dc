import { z } from 'zod';

export const roleSchema = z.enum(['owner', 'editor', 'viewer']);
export type Role = z.infer<typeof roleSchema>;

// Each role can do everything the roles below it can.
const rank: Record<Role, number> = { viewer: 1, editor: 2, owner: 3 };

export function roleAtLeast(role: Role, minimum: Role): boolean {
	return rank[role] >= rank[minimum];
}
