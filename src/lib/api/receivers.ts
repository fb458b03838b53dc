/**
 * The receiver profile API's contract (`/api/workspaces/{ws}/receivers/…`): what each route accepts
 * and answers. Profiles are versioned like maps (a draft guarded by its version, published
 * revisions); a draft holds the profile, the map revision it is linked to and its links. Only
 * mathjs-free parts of the receivers library are imported here, since the browser loads this
 * module with the client (docs/receivers.md).
 */
import { z } from 'zod';
import { linkReportSchema as libraryLinkReportSchema } from '../can/receivers/link-report-schema';
import { linkSchema } from '../can/receivers/link-schema';
import {
	PROFILE_FORMAT,
	receiverKindSchema,
	receiverProfileSchema,
	wantedChannelSchema
} from '../can/receivers/profile';
import { profileDiffSchema as libraryProfileDiffSchema } from '../can/receivers/profile-diff';
import { captureCheckSchema as libraryCaptureCheckSchema } from '../can/receivers/capture-check-schema';
import { relinkResultSchema as libraryRelinkResultSchema } from '../can/receivers/relink-result-schema';
import { roleSchema } from '../roles';
import { alertReplaySchema } from './capture-views';
import { revisionRefSchema, revisionSummarySchema } from './maps';
import { named, personRefSchema, timestampSchema } from './shapes';

// ---- the draft ----

const recordId = (what: string) =>
	z
		.string({ error: `Choose a ${what} (its id is missing).` })
		.trim()
		.min(1, `Choose a ${what} (its id is empty).`)
		.max(100, `That is too long to be a ${what} id.`);

/** The map revision a profile's links point at. */
export const profileTargetSchema = z.strictObject({
	mapId: recordId('map'),
	revision: z
		.number({ error: 'revision must be a revision number (1, 2, …)' })
		.int('revision must be a revision number (1, 2, …)')
		.min(1, 'revision must be a revision number (1, 2, …)')
});
export type ProfileTarget = z.infer<typeof profileTargetSchema>;

/**
 * A profile's draft: the profile itself, the map revision it is linked to and one link per linked
 * wanted channel. Links made by hand are listed in the profile's `manualLinks` too (so the profile
 * file keeps them); the two must agree.
 */
export const profileDraftSchema = z
	.strictObject({
		profile: receiverProfileSchema,
		target: profileTargetSchema.nullable().default(null),
		links: z.array(linkSchema).max(1000, 'at most 1000 links').default([])
	})
	.superRefine((draft, ctx) => {
		const names = new Set(draft.profile.wanted.map((w) => w.name.toLowerCase()));
		const manual = new Map(draft.profile.manualLinks.map((m) => [m.wanted.toLowerCase(), m]));
		const linked = new Set<string>();
		if (draft.links.length > 0 && draft.target === null)
			ctx.addIssue({
				code: 'custom',
				path: ['target'],
				message: 'links need the map revision they point at; choose a map and revision'
			});
		draft.links.forEach((link, i) => {
			const key = link.wanted.toLowerCase();
			if (!names.has(key))
				ctx.addIssue({
					code: 'custom',
					path: ['links', i, 'wanted'],
					message: `"${link.wanted}" is not a wanted channel of this profile; remove its link`
				});
			if (linked.has(key))
				ctx.addIssue({
					code: 'custom',
					path: ['links', i, 'wanted'],
					message: `"${link.wanted}" is linked twice; keep one link`
				});
			linked.add(key);
			const byHand = manual.get(key);
			const agrees = byHand && byHand.frame === link.frame && byHand.signal === link.signal;
			if (link.manual !== Boolean(agrees))
				ctx.addIssue({
					code: 'custom',
					path: ['links', i, 'manual'],
					message: link.manual
						? `the link of "${link.wanted}" is marked as made by hand but the profile's manualLinks do not name ${link.frame} · ${link.signal}`
						: `"${link.wanted}" is linked by hand to ${byHand!.frame} · ${byHand!.signal} in manualLinks, but its link says ${link.frame} · ${link.signal}`
				});
		});
	});
export type ProfileDraft = z.output<typeof profileDraftSchema>;

// ---- requests ----

const version = z
	.number({ error: 'Send the draft version you loaded (a whole number).' })
	.int()
	.min(1);
/** Larger than any real profile file; keeps one request from filling the database. */
const MAX_IMPORT_CHARS = 2_000_000;

/** Blank (a name and a kind) or from a `framewright-profile@1` file. */
export const createProfileInputSchema = z
	.strictObject({
		name: z
			.string()
			.trim()
			.min(1, 'A profile needs a name.')
			.max(200, 'Use at most 200 characters.')
			.optional(),
		kind: receiverKindSchema.optional(),
		profileJson: z
			.string()
			.max(MAX_IMPORT_CHARS, 'The profile file is larger than 2 MB.')
			.optional()
	})
	.superRefine((body, ctx) => {
		if (body.profileJson === undefined && body.name === undefined)
			ctx.addIssue({ code: 'custom', path: ['name'], message: 'A blank profile needs a name.' });
	});
export type CreateProfileInput = z.infer<typeof createProfileInputSchema>;

export const profileDraftInputSchema = z.strictObject({ version, draft: profileDraftSchema });

/** Candidates and automatic links for the working copy (nothing is stored). */
export const linkSuggestionsInputSchema = z.strictObject({
	profile: receiverProfileSchema,
	target: profileTargetSchema,
	allowShared: z.boolean().default(false)
});

/** One wanted channel linked by hand to a frame · signal of a map revision (nothing is stored). */
export const manualLinkInputSchema = z.strictObject({
	wanted: wantedChannelSchema,
	target: profileTargetSchema,
	frame: z.string().trim().min(1, 'Choose the frame that carries the signal.'),
	signal: z.string().trim().min(1, 'Choose the signal to link.')
});

/** `?to=<n>`: the map revision to review against; the map's latest when absent. */
export const relinkQuerySchema = z.object({
	to: z
		.string()
		.trim()
		.regex(/^r?[1-9]\d{0,8}$/, 'to must be a revision number like 3 (or r3)')
		.transform((s) => Number(s.replace(/^r/, '')))
		.optional()
});

export const relinkInputSchema = z.strictObject({
	version,
	revision: z.number().int().min(1, 'revision must be a revision number (1, 2, …)'),
	/** Wanted channels whose broken link takes the suggested signal of the new revision. */
	accept: z.array(z.string().trim().min(1)).max(1000).default([])
});

const profileRevisionRef = z.union([z.number().int().min(1), z.literal('draft')], {
	error: 'rev must be a revision number (1, 2, …) or "draft"'
});

export const checkInputSchema = z.strictObject({
	capture: recordId('capture'),
	rev: profileRevisionRef.default('draft')
});

export const deviceAlertsInputSchema = checkInputSchema.extend({
	acknowledgements: z
		.array(
			z.strictObject({
				ruleId: z.string().min(1, 'ruleId must be the id of a rule'),
				time: z.number({ error: 'time must be a number of seconds from the start of the capture' })
			})
		)
		.max(10_000, 'at most 10,000 acknowledgements')
		.default([])
});

export const receiverExportFormatSchema = z.enum(['receive-set', 'profile'], {
	error: 'format must be receive-set or profile'
});
export type ReceiverExportFormat = z.infer<typeof receiverExportFormatSchema>;

/** `?rev=<n|draft>&format=receive-set|profile` of a profile download. */
export const receiverExportQuerySchema = z.object({
	rev: revisionRefSchema.default('draft'),
	format: receiverExportFormatSchema.default('receive-set')
});

/** The install sheet's `?rev=<n|draft>`. */
export const installSheetQuerySchema = receiverExportQuerySchema.pick({ rev: true });

/** `?capture=<id>&rev=<n|draft>` of the check page. */
export const checkPageQuerySchema = z.object({
	capture: z.string().trim().min(1).max(100).optional(),
	rev: revisionRefSchema.default('draft')
});

// ---- answers ----

const linkReportSchema = named(
	libraryLinkReportSchema,
	'LinkReport',
	'Links, unlinked wanted channels with their best candidates (score and reason) and links made by hand that cannot be made (src/lib/can/receivers/linking.ts).'
);
const relinkResultSchema = named(
	libraryRelinkResultSchema,
	'RelinkResult',
	'Each link kept, changed or broken on the new map revision, with details and suggestions (src/lib/can/receivers/relink.ts).'
);
const captureCheckSchema = named(
	libraryCaptureCheckSchema,
	'CaptureCheck',
	"Per wanted channel the installer's checklist on a capture: samples, update interval, display range, stuck value (src/lib/can/receivers/check.ts)."
);
const profileDiffSchema = named(
	libraryProfileDiffSchema,
	'ProfileDiff',
	'Field-by-field differences between two snapshots of a profile (src/lib/can/receivers/profile-diff.ts).'
);
export const deviceAlertReplaySchema = alertReplaySchema;

/** The map revision a profile is linked to, as lists and pages show it. */
export const linkedMapSchema = z.object({
	/** null once the map is deleted. */
	id: z.string().nullable(),
	name: z.string(),
	revision: z.number().int(),
	/** The map's newest revision; above `revision` the profile should be relinked. */
	latestRevision: z.number().int().nullable()
});
export type LinkedMap = z.infer<typeof linkedMapSchema>;

export const profileSummarySchema = z.object({
	id: z.string(),
	name: z.string(),
	kind: receiverKindSchema,
	wantedCount: z.number().int(),
	linkedCount: z.number().int(),
	map: linkedMapSchema.nullable(),
	latestRevision: z.number().int().nullable(),
	updatedAt: timestampSchema,
	updatedBy: personRefSchema.nullable()
});
export type ProfileSummary = z.infer<typeof profileSummarySchema>;

export const profileListResponseSchema = z.object({ profiles: z.array(profileSummarySchema) });
export type ProfileListResponse = z.infer<typeof profileListResponseSchema>;

export const createdProfileResponseSchema = z.object({
	profile: z.object({ id: z.string(), name: z.string() })
});
export type CreatedProfileResponse = z.infer<typeof createdProfileResponseSchema>;

/** A map of the workspace with its published revisions, newest first, for the link target picker. */
export const mapChoiceSchema = z.object({
	id: z.string(),
	name: z.string(),
	revisions: z.array(z.number().int())
});
export type MapChoice = z.infer<typeof mapChoiceSchema>;

/** GET of one profile, and the first paint of its editor. */
export const profileViewSchema = z.object({
	profile: z.object({
		id: z.string(),
		name: z.string(),
		draft: profileDraftSchema,
		version: z.number().int(),
		updatedAt: timestampSchema,
		updatedBy: personRefSchema.nullable()
	}),
	/** The map revision the draft is linked to (null when not linked). */
	linkedMap: linkedMapSchema.nullable(),
	/** The draft was linked to a map that has since been deleted; its links went with it. */
	mapDeleted: z.boolean(),
	revisions: z.array(revisionSummarySchema),
	maps: z.array(mapChoiceSchema),
	role: roleSchema
});
export type ProfileView = z.infer<typeof profileViewSchema>;

export const profileDraftSavedResponseSchema = z.object({ version: z.number().int() });
export type ProfileDraftSavedResponse = z.infer<typeof profileDraftSavedResponseSchema>;

export const profilePublishedResponseSchema = z.object({
	revision: z.object({ number: z.number().int() })
});
export type ProfilePublishedResponse = z.infer<typeof profilePublishedResponseSchema>;

export const profileRevisionListResponseSchema = z.object({
	revisions: z.array(revisionSummarySchema)
});
export type ProfileRevisionListResponse = z.infer<typeof profileRevisionListResponseSchema>;

export const profileDiffResponseSchema = z.object({
	diff: profileDiffSchema,
	from: z.string(),
	to: z.string()
});
export type ProfileDiffResponse = z.infer<typeof profileDiffResponseSchema>;

export const linkSuggestionsResponseSchema = z.object({ report: linkReportSchema });
export type LinkSuggestionsResponse = z.infer<typeof linkSuggestionsResponseSchema>;

export const manualLinkResponseSchema = z.object({
	link: linkSchema,
	reason: z.string()
});
export type ManualLinkResponse = z.infer<typeof manualLinkResponseSchema>;

export const relinkReviewSchema = z.object({
	map: z.object({ id: z.string(), name: z.string() }),
	from: z.number().int(),
	to: z.number().int(),
	/** The map's revisions newer than `from`, newest first. */
	newer: z.array(z.number().int()),
	result: relinkResultSchema
});
export type RelinkReview = z.infer<typeof relinkReviewSchema>;

export const relinkedResponseSchema = z.object({
	version: z.number().int(),
	revision: z.number().int(),
	kept: z.number().int(),
	changed: z.number().int(),
	accepted: z.number().int(),
	dropped: z.number().int()
});
export type RelinkedResponse = z.infer<typeof relinkedResponseSchema>;

export const checkResponseSchema = z.object({
	capture: z.object({ id: z.string(), name: z.string() }),
	map: z.object({ id: z.string(), name: z.string(), revision: z.number().int() }),
	/** `r3` or `draft`: which snapshot of the profile was checked. */
	profile: z.string(),
	check: captureCheckSchema
});
export type CheckResponse = z.infer<typeof checkResponseSchema>;

export { PROFILE_FORMAT };
