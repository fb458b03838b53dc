/**
 * The map API's contract (`/api/workspaces/{ws}/maps/…`): what each route accepts and answers.
 * Unknown fields are refused (`strictObject`) so a typo never passes silently.
 */
import { z } from 'zod';
import { lintProblemSchema as libraryLintProblemSchema } from '../can/lint';
import { codegenPrefixSchema } from '../can/codegen/identifiers';
import { canMapSchema } from '../can/map';
import { mapDiffSchema as libraryMapDiffSchema } from '../can/map-diff';
import { roleSchema } from '../roles';
import { named, personRefSchema, timestampSchema } from './shapes';

/** A map in the `framewright-map@1` format (docs/map-format.md), as drafts and revisions carry it. */
const mapSchema = named(
	canMapSchema,
	'Map',
	'A broadcast map in the framewright-map@1 format (docs/map-format.md): frames and their signals, alert rules.'
);

// ---- requests ----

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

/** Blank (a name only), from map JSON, or from the CSV signal table. */
export const createMapInputSchema = z
	.strictObject({
		name: mapName.optional(),
		mapJson: z.string().max(MAX_IMPORT_CHARS, 'The map file is larger than 5 MB.').optional(),
		signalTableCsv: z
			.string()
			.max(MAX_IMPORT_CHARS, 'The signal table is larger than 5 MB.')
			.optional(),
		/** Bit rate of a blank map or a signal-table import (a map file carries its own). */
		bitrate: canMapSchema.shape.bitrate.unwrap().optional()
	})
	.superRefine((body, ctx) => {
		if (body.mapJson !== undefined && body.signalTableCsv !== undefined) {
			ctx.addIssue({
				code: 'custom',
				path: ['signalTableCsv'],
				message: 'Send either mapJson or signalTableCsv, not both.'
			});
		}
		if (body.mapJson !== undefined && body.bitrate !== undefined) {
			ctx.addIssue({
				code: 'custom',
				path: ['bitrate'],
				message: 'A map file carries its own bit rate; change it in the file or after importing.'
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
export type CreateMapInput = z.infer<typeof createMapInputSchema>;

export const draftInputSchema = z.strictObject({ version, draft: mapSchema });
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

const BITRATE_HINT = 'A whole number of bit/s from 1000 to 8000000, e.g. 500000.';
/** The map settings' bit rate: the map format's own bounds, with words a person can act on. */
export const bitrateInputSchema = z.strictObject({
	bitrate: z
		.number({ error: BITRATE_HINT })
		.refine((n) => canMapSchema.shape.bitrate.safeParse(n).success, BITRATE_HINT),
	version
});
export const shareLinkInputSchema = z.strictObject({
	revision: z.number().int().min(1),
	expiresAt: z.iso
		.datetime({ offset: true, error: 'An ISO date and time like 2027-01-31T18:00:00Z.' })
		.nullable()
		.optional()
});

/** The form naming a share link to revoke (the JSON route has it in its path). */
export const shareLinkRefSchema = z.strictObject({
	id: z.string({ error: 'Say which link.' }).min(1, 'Say which link.')
});

/**
 * The share-link form: the last day the link works (`2027-01-31`: through its end, in UTC when the
 * page runs without scripts) or, added by the page's script, that day's end in the person's own
 * time zone (`expiresAt`). Answers the JSON route's fields.
 */
export const shareLinkFormSchema = z
	.strictObject({
		revision: z.number({ error: 'Choose a published revision.' }).int().min(1),
		expires: z.iso.date({ error: 'A date like 2027-01-31.' }).optional(),
		expiresAt: shareLinkInputSchema.shape.expiresAt
	})
	.transform(({ revision, expires, expiresAt }) => ({
		revision,
		expiresAt: expiresAt ?? (expires ? `${expires}T23:59:59Z` : null)
	}));

// ---- revision references (`?rev=3`, `?from=r2&to=draft`) ----

/** A revision number, or the working draft: the word every export, sheet and diff uses. */
export type RevisionRef = number | 'draft';

/** `3`, `r3` or `draft` from a URL; anything else is refused with a message naming the form. */
export const revisionRefSchema = z
	.string()
	.trim()
	.toLowerCase()
	.regex(/^(draft|r?[1-9]\d{0,8})$/, 'must be a revision number like 3 (or r3) or "draft"')
	.transform((s): RevisionRef => (s === 'draft' ? 'draft' : Number(s.replace(/^r/, ''))));

/** `r3` or `draft`. */
export const revisionLabel = (ref: RevisionRef) => (ref === 'draft' ? 'draft' : `r${ref}`);

export const exportFormatSchema = z.enum(['json', 'csv'], { error: 'format must be json or csv' });
export type ExportFormat = z.infer<typeof exportFormatSchema>;

/** `?rev=<n|draft>&format=json|csv` of a map download. */
export const mapExportQuerySchema = z.object({
	rev: revisionRefSchema.default('draft'),
	format: exportFormatSchema.default('json')
});

/** `?rev=<n|draft>&file=h|c[&prefix=fw]` of the C code download (docs/codegen.md). */
export const codegenQuerySchema = z.object({
	rev: revisionRefSchema.default('draft'),
	file: z.enum(['h', 'c'], { error: 'file must be h (the header) or c (the source)' }),
	prefix: codegenPrefixSchema.default('fw')
});
export type CodegenQuery = z.infer<typeof codegenQuerySchema>;

/** `?from=<n|draft>&to=<n|draft>` of the diff route. */
export const diffQuerySchema = z.object({ from: revisionRefSchema, to: revisionRefSchema });

/** The diff page's query: without `from` it compares the latest revision; `to` is the draft unless given. */
export const diffPageQuerySchema = z.object({
	from: revisionRefSchema.optional(),
	to: revisionRefSchema.default('draft')
});

/** The reference sheet page's `?rev=<n|draft>`. */
export const sheetQuerySchema = mapExportQuerySchema.pick({ rev: true });

// ---- answers ----

export const lintProblemSchema = named(
	libraryLintProblemSchema,
	'LintProblem',
	'A map problem with severity, code, message, frame/signal index and the JSON path of the field to fix (docs/map-format.md lists the codes).'
);
const mapDiffSchema = named(
	libraryMapDiffSchema,
	'MapDiff',
	'Field-by-field differences between two maps: map fields, frames matched by ID, signals by name, alert rules by id.'
);

export const mapSummarySchema = z.object({
	id: z.string(),
	name: z.string(),
	updatedAt: timestampSchema,
	updatedBy: personRefSchema.nullable(),
	latestRevision: z.number().int().nullable(),
	frameCount: z.number().int()
});
export type MapSummary = z.infer<typeof mapSummarySchema>;

export const mapListResponseSchema = z.object({ maps: z.array(mapSummarySchema) });
export type MapListResponse = z.infer<typeof mapListResponseSchema>;

export const mapRefSchema = z.object({ id: z.string(), name: z.string() });
export const createdMapResponseSchema = z.object({ map: mapRefSchema });
export type CreatedMapResponse = z.infer<typeof createdMapResponseSchema>;

export const revisionSummarySchema = z.object({
	number: z.number().int(),
	note: z.string(),
	publishedAt: timestampSchema,
	publishedBy: personRefSchema.nullable()
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** GET of one map, and the first paint of its editor pages. */
export const mapViewSchema = z.object({
	map: z.object({
		id: z.string(),
		name: z.string(),
		draft: mapSchema,
		version: z.number().int(),
		updatedAt: timestampSchema,
		updatedBy: personRefSchema.nullable()
	}),
	lint: z.array(lintProblemSchema),
	revisions: z.array(revisionSummarySchema),
	role: roleSchema
});
export type MapView = z.infer<typeof mapViewSchema>;

export const renamedMapResponseSchema = z.object({ map: mapRefSchema, version: z.number().int() });
export type RenamedMapResponse = z.infer<typeof renamedMapResponseSchema>;

export const draftSavedResponseSchema = z.object({
	version: z.number().int(),
	lint: z.array(lintProblemSchema)
});
export type DraftSavedResponse = z.infer<typeof draftSavedResponseSchema>;

/**
 * The 409 of a stale save or publish: the draft's version now, so the page can offer a reload, and
 * who changed it when (the command line explains the refusal with them).
 */
export const staleDraftProblemSchema = z.looseObject({
	error: z.string(),
	currentVersion: z.number().int(),
	updatedAt: timestampSchema,
	updatedBy: personRefSchema.nullable()
});

export const revisionListResponseSchema = z.object({ revisions: z.array(revisionSummarySchema) });
export type RevisionListResponse = z.infer<typeof revisionListResponseSchema>;

export const publishedResponseSchema = z.object({
	revision: z.object({ number: z.number().int() }),
	/** Members told by e-mail (everyone but the publisher, less any mail that failed). */
	notified: z.number().int()
});
export type PublishedResponse = z.infer<typeof publishedResponseSchema>;

export const revisionViewSchema = z.object({
	revision: revisionSummarySchema.extend({ map: mapSchema }),
	lint: z.array(lintProblemSchema)
});
export type RevisionView = z.infer<typeof revisionViewSchema>;

export const diffResponseSchema = z.object({
	diff: mapDiffSchema,
	/** The labels compared, `r3` or `draft`. */
	from: z.string(),
	to: z.string()
});
export type DiffResponse = z.infer<typeof diffResponseSchema>;

export const versionResponseSchema = z.object({ version: z.number().int() });
export type VersionResponse = z.infer<typeof versionResponseSchema>;

export const shareLinkViewSchema = z.object({
	id: z.string(),
	revision: z.number().int(),
	createdAt: timestampSchema,
	createdBy: personRefSchema.nullable(),
	expiresAt: timestampSchema.nullable(),
	revokedAt: timestampSchema.nullable(),
	status: z.enum(['active', 'revoked', 'expired'])
});
export type ShareLinkView = z.infer<typeof shareLinkViewSchema>;
export type ShareLinkStatus = ShareLinkView['status'];

export const shareLinkListResponseSchema = z.object({ shareLinks: z.array(shareLinkViewSchema) });
export type ShareLinkListResponse = z.infer<typeof shareLinkListResponseSchema>;

/** The link's URL (with its token) is in this answer only; the database keeps a hash. */
export const createdShareLinkResponseSchema = z.object({
	shareLink: shareLinkViewSchema.extend({ url: z.string() })
});
export type CreatedShareLinkResponse = z.infer<typeof createdShareLinkResponseSchema>;
