/**
 * The access-token form of the tokens page: its choices and the schema its action parses with.
 * Read-only tokens act as a viewer, edit tokens as an editor (docs/cli.md, "Remote use").
 */
import { z } from 'zod';
import { tokenRoleSchema, type TokenRole } from '$lib/roles';

export const ACCESS_LABELS: Record<TokenRole, string> = {
	viewer: 'Read-only',
	editor: 'Edit'
};

export const ACCESS_HINTS: Record<TokenRole, string> = {
	viewer: 'list and pull maps, lint, upload captures, decode and download (a viewer’s rights)',
	editor: 'also push drafts and publish revisions (an editor’s rights)'
};

/** Days a new token lasts; a token always expires. */
export const EXPIRY_DAYS = [7, 30, 90, 365] as const;
export const DEFAULT_EXPIRY_DAYS = 30;

export const tokenFormSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Give the token a name, such as the pipeline that will use it.')
		.max(80, 'Use at most 80 characters.'),
	role: z.enum(tokenRoleSchema.options, { error: 'Choose read-only or edit.' }),
	expiresInDays: z.coerce
		.number()
		.refine(
			(days) => (EXPIRY_DAYS as readonly number[]).includes(days),
			'Choose one of the offered expiries.'
		)
});

export const revokeFormSchema = z.object({
	id: z.string().regex(/^[0-9a-f]{16}$/, 'That is not a token id.')
});
