import { z } from 'zod';
import { canMapSchema } from '$lib/can/map';

// Bodies the map API accepts; unknown fields are refused so typos do not pass silently.

const version = z
	.number({ error: 'Send the draft version you loaded (a whole number).' })
	.int()
	.min(1);
const mapName = z
	.string()
	.trim()
	.min(1, 'A map needs a name.')
	.max(200, 'Use at most 200 characters.');
/** Larger than any real map file; keeps one request from filling the database. */
const MAX_IMPORT_CHARS = 5_000_000;

export const createMapInputSchema = z
	.strictObject({
		name: mapName.optional(),
		mapJson: z.string().max(MAX_IMPORT_CHARS, 'The map file is larger than 5 MB.').optional(),
		signalTableCsv: z
			.string()
			.max(MAX_IMPORT_CHARS, 'The signal table is larger than 5 MB.')
			.optional()
	})
	.superRefine((body, ctx) => {
		if (body.mapJson !== undefined && body.signalTableCsv !== undefined) {
			ctx.addIssue({
				code: 'custom',
				path: ['signalTableCsv'],
				message: 'Send either mapJson or signalTableCsv, not both.'
			});
		}
		if (
			body.mapJson === undefined &&
			body.signalTableCsv === undefined &&
			body.name === undefined
		) {
			ctx.addIssue({ code: 'custom', path: ['name'], message: 'A blank map needs a name.' });
		}
	});

export const draftInputSchema = z.strictObject({ version, draft: canMapSchema });
export const renameInputSchema = z.strictObject({ name: mapName, version });
export const publishInputSchema = z.strictObject({
	note: z
		.string({ error: 'Write a note saying what changed.' })
		.trim()
		.min(1, 'Write a note saying what changed.')
		.max(2000, 'Use at most 2000 characters.'),
	version
});
export const restoreInputSchema = z.strictObject({ revision: z.number().int().min(1), version });
export const shareLinkInputSchema = z.strictObject({
	revision: z.number().int().min(1),
	expiresAt: z.iso
		.datetime({ offset: true, error: 'An ISO date and time like 2027-01-31T18:00:00Z.' })
		.nullable()
		.optional()
});

export const exportFormatSchema = z.enum(['json', 'csv'], { error: 'format must be json or csv' });
export type ExportFormat = z.infer<typeof exportFormatSchema>;
