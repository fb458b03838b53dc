import { z } from 'zod';
import { roleSchema } from './roles';

// Inputs accepted by forms and the JSON API; unknown fields are refused so typos do not pass silently.

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
