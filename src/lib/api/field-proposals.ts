/**
 * The contract of the field-proposal routes of a processed capture (docs/field-proposals.md, "On
 * the capture page"): proposals for the IDs the decode's map does not define, the ranking of
 * candidate fields against a decoded channel, and accepting proposals into a map's draft.
 */
import { z } from 'zod';
import { idProposalsSchema } from '../can/fields/proposal';
import { lintProblemSchema } from '../can/lint';
import { byteOrderSchema, canIdSchema, signalSchema } from '../can/map';
import { frameExistsProblemSchema, hexId, recordId, wholeNumber } from './capture-views';
import { staleDraftProblemSchema } from './maps';
import { named } from './shapes';

const extendedFlag = z
	.enum(['0', '1'], { error: 'extended must be 0 or 1' })
	.transform((v) => v === '1');

export const fieldsQuerySchema = z.object({
	decode: recordId('decode'),
	/** Only this unknown ID (hex); every unknown ID of the decode when absent. */
	id: hexId.optional(),
	extended: extendedFlag.optional()
});
export type FieldsQuery = z.infer<typeof fieldsQuerySchema>;

/** The map draft that accepted proposals would go to, as the page loaded it. */
export const fieldsDraftSchema = z.object({
	mapId: z.string(),
	mapName: z.string(),
	/** The draft's version: an accept names it, and a draft changed since answers 409. */
	version: z.number().int()
});

export const fieldsResponseSchema = z.object({
	draft: fieldsDraftSchema,
	/** Every map draft of the workspace an editor may accept into (the decode's map among them), by name. */
	drafts: z.array(fieldsDraftSchema),
	ids: z.array(named(idProposalsSchema, 'IdProposals', 'Proposed fields of one identifier.'))
});
export type FieldsResponse = z.infer<typeof fieldsResponseSchema>;

/** Most scatter points a correlation request may ask for. */
export const MAX_SCATTER_POINTS = 5000;

export const correlateQuerySchema = z.object({
	decode: recordId('decode'),
	channel: wholeNumber('channel', 0, 1_000_000),
	points: wholeNumber('points', 10, MAX_SCATTER_POINTS).default(1000)
});
export type CorrelateQuery = z.infer<typeof correlateQuerySchema>;

export const correlationRowSchema = z.object({
	id: z.number().int(),
	extended: z.boolean(),
	startBit: z.number().int(),
	length: z.number().int(),
	byteOrder: byteOrderSchema,
	signed: z.boolean(),
	/** The multiplexor page the field belongs to (null: every frame). */
	muxValue: z.number().int().nullable(),
	/** Frame times at which both the field and the channel had a value. */
	samples: z.number().int(),
	pearson: z.number().nullable(),
	spearman: z.number().nullable(),
	/** Least squares channel ≈ raw × scale + offset. */
	scale: z.number().nullable(),
	offset: z.number().nullable(),
	/** Root mean square of what the line leaves unexplained, in the channel's unit. */
	residual: z.number().nullable()
});
export type CorrelationRow = z.infer<typeof correlationRowSchema>;

/** Most rows of a ranking returned. */
export const MAX_RANKING = 20;

export const correlateResponseSchema = z.object({
	channel: z.object({
		index: z.number().int(),
		frameName: z.string(),
		signalName: z.string(),
		unit: z.string()
	}),
	/** Value proposals of unknown IDs compared. */
	candidates: z.number().int(),
	/** Best first (|Pearson|, then |Spearman|), at most MAX_RANKING. */
	ranking: z.array(correlationRowSchema),
	/** Pairs (raw value of the best field, channel value), evenly spread over time; empty without a best. */
	scatter: z.object({ raw: z.array(z.number()), channel: z.array(z.number()) })
});
export type CorrelateResponse = z.infer<typeof correlateResponseSchema>;

export const acceptFieldsInputSchema = z
	.strictObject({
		decode: recordId('decode'),
		/** The map whose draft gets the frame; the decode's map when absent. */
		mapId: recordId('map').optional(),
		/** The draft version the proposals were read against (fieldsResponse.draft.version). */
		version: z.number({ error: 'give the draft version' }).int().min(0),
		id: canIdSchema,
		extended: z.boolean({ error: 'extended must be true or false' }),
		/** The new frame's name; `Undocumented_0x…` when absent. */
		frameName: z.string().trim().min(1).max(120).optional(),
		signals: z
			.array(signalSchema)
			.min(1, 'select at least one proposal to accept')
			.max(128, 'at most 128 signals at once')
	})
	.refine((d) => d.extended || d.id <= 0x7ff, {
		path: ['id'],
		message: 'a standard (11-bit) ID is at most 0x7FF'
	})
	.refine((d) => new Set(d.signals.map((s) => s.name)).size === d.signals.length, {
		path: ['signals'],
		message: 'two accepted signals have the same name; give each its own'
	});
export type AcceptFieldsInput = z.infer<typeof acceptFieldsInputSchema>;

export const acceptedFieldsResponseSchema = z.object({
	mapId: z.string(),
	/** The draft's version after the change. */
	version: z.number().int(),
	frameIndex: z.number().int(),
	/** Lint problems of the new frame (a draft may hold them; publishing refuses errors). */
	lint: z.array(lintProblemSchema)
});
export type AcceptedFieldsResponse = z.infer<typeof acceptedFieldsResponseSchema>;

/** The 409 of an accept: the draft changed since it was read, or it already defines the ID. */
export const acceptConflictProblemSchema = z.union([
	staleDraftProblemSchema,
	frameExistsProblemSchema
]);
