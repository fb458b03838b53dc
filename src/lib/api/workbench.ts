/**
 * The contract of the capture workbench: the view state the page keeps in its URL and in saved
 * views, the saved-view routes, and the derived-channel series and export
 * (docs/derived-channels.md).
 */
import { z } from 'zod';
import { MAX_FORMULA_LENGTH } from '../can/derived/formula';
import { MAX_SERIES_POINTS } from './capture-views';

/** `c12`: decoded channel 12 of the decode; `d0`: the view's first derived channel. */
export const channelRefSchema = z
	.string()
	.regex(/^[cd]\d{1,6}$/, 'a channel is c<number> (decoded) or d<number> (derived)');
export type ChannelRef = z.infer<typeof channelRefSchema>;

export const MAX_DERIVED = 12;
export const MAX_STRIPS = 8;
export const MAX_PER_STRIP = 8;

export const derivedDefinitionSchema = z.strictObject({
	name: z
		.string()
		.trim()
		.min(1, 'give the derived channel a name')
		.max(60, 'a name may have at most 60 characters'),
	unit: z.string().trim().max(20, 'a unit may have at most 20 characters').default(''),
	formula: z
		.string()
		.trim()
		.min(1, 'write a formula')
		.max(MAX_FORMULA_LENGTH, `a formula may have at most ${MAX_FORMULA_LENGTH} characters`)
});
export type DerivedDefinition = z.infer<typeof derivedDefinitionSchema>;

export const WORKBENCH_PANELS = [
	'decodes',
	'channels',
	'derived',
	'frames',
	'ids',
	'unknown',
	'bus',
	'alerts',
	'j1939',
	'export'
] as const;
export type WorkbenchPanel = (typeof WORKBENCH_PANELS)[number];

export const ANALYSIS_TOOLS = ['stats', 'xy', 'histogram'] as const;
export type AnalysisTool = (typeof ANALYSIS_TOOLS)[number];

const finiteNumber = z.number().refine(Number.isFinite, 'must be a finite number');

/** Everything a view of a capture shows; the page writes it to its URL and saved views keep it. */
export const workbenchStateSchema = z
	.strictObject({
		/** The decode shown; the newest when absent. */
		decode: z.string().min(1).max(100).optional(),
		panel: z.enum(WORKBENCH_PANELS).default('channels'),
		/** `side`: the panel beside the plot; `below`: under it. */
		dock: z.enum(['side', 'below']).default('side'),
		/** Plot strips, top to bottom, each with the channels drawn on its one value axis. */
		strips: z
			.array(z.array(channelRefSchema).min(1).max(MAX_PER_STRIP))
			.max(MAX_STRIPS)
			.default([]),
		/** The time window (seconds from the first frame); the whole capture when absent. */
		from: finiteNumber.optional(),
		to: finiteNumber.optional(),
		derived: z.array(derivedDefinitionSchema).max(MAX_DERIVED).default([]),
		tool: z.enum(ANALYSIS_TOOLS).default('stats'),
		/** The XY plot's axes. */
		x: channelRefSchema.optional(),
		y: channelRefSchema.optional(),
		/** The channel of the histogram. */
		hist: channelRefSchema.optional(),
		/** Threshold for "time above" in the statistics. */
		above: finiteNumber.optional()
	})
	.refine((s) => s.from === undefined || s.to === undefined || s.from < s.to, {
		path: ['to'],
		message: 'the window must end after it starts'
	});
export type WorkbenchState = z.output<typeof workbenchStateSchema>;

// ---- saved views ----

export const saveViewInputSchema = z.strictObject({
	name: z
		.string()
		.trim()
		.min(1, 'give the view a name')
		.max(80, 'a view name may have at most 80 characters'),
	state: workbenchStateSchema
});
export type SaveViewInput = z.input<typeof saveViewInputSchema>;

export const savedViewSchema = z.object({
	id: z.string(),
	name: z.string(),
	state: workbenchStateSchema,
	savedBy: z.object({ name: z.string().nullable(), email: z.string() }).nullable(),
	savedAt: z.string(),
	/** The person asking may delete it (their own view, or any view for an owner). */
	canDelete: z.boolean()
});
export type SavedView = z.infer<typeof savedViewSchema>;

export const savedViewListSchema = z.object({ views: z.array(savedViewSchema) });
export type SavedViewList = z.infer<typeof savedViewListSchema>;

// ---- derived channels ----

const recordId = z.string().trim().min(1, 'give the decode id').max(100);

const decimal = (name: string) =>
	z
		.string()
		.trim()
		.regex(/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/, `${name} must be a number`)
		.transform(Number)
		.pipe(z.number().refine(Number.isFinite, `${name} must be a finite number`));

export const derivedSeriesQuerySchema = z
	.object({
		decode: recordId,
		formula: derivedDefinitionSchema.shape.formula,
		from: decimal('from').optional(),
		to: decimal('to').optional(),
		points: z
			.string()
			.trim()
			.regex(/^\d{1,6}$/, 'points must be a whole number')
			.transform(Number)
			.pipe(z.number().int().min(1).max(MAX_SERIES_POINTS))
			.default(2000)
	})
	.refine((q) => q.from === undefined || q.to === undefined || q.from <= q.to, {
		path: ['to'],
		message: 'to must not be before from'
	});
export type DerivedSeriesQuery = z.output<typeof derivedSeriesQuerySchema>;

/** A derived channel over a time range, min/max-decimated like a decoded one. */
export const derivedSeriesResponseSchema = z.object({
	/** Decoded channel indices the formula reads. */
	inputs: z.array(z.number().int()),
	time: z.array(z.number()),
	value: z.array(z.number()),
	decimated: z.boolean(),
	samplesInRange: z.number().int(),
	/** Samples of the whole derived channel. */
	count: z.number().int()
});
export type DerivedSeriesResponse = z.infer<typeof derivedSeriesResponseSchema>;

export const spanQuerySchema = z
	.object({
		decode: recordId,
		/** The channel measured, as a formula (a decoded channel is `{Frame.Signal}`). */
		formula: derivedDefinitionSchema.shape.formula,
		/** A second channel for the XY plot (its values on the y axis). */
		versus: derivedDefinitionSchema.shape.formula.optional(),
		from: decimal('from').optional(),
		to: decimal('to').optional(),
		above: decimal('above').optional(),
		bins: z
			.string()
			.trim()
			.regex(/^\d{1,3}$/, 'bins must be a whole number')
			.transform(Number)
			.pipe(z.number().int().min(1).max(200))
			.default(20)
	})
	.refine((q) => q.from === undefined || q.to === undefined || q.from <= q.to, {
		path: ['to'],
		message: 'to must not be before from'
	});
export type SpanQuery = z.output<typeof spanQuerySchema>;

/** Most pairs an XY answer carries (thinned by an even stride beyond). */
export const MAX_XY_POINTS = 4000;

export const spanResponseSchema = z.object({
	from: z.number(),
	to: z.number(),
	statistics: z.object({
		count: z.number().int(),
		min: z.number().nullable(),
		max: z.number().nullable(),
		mean: z.number().nullable(),
		standardDeviation: z.number().nullable(),
		secondsAbove: z.number().nullable(),
		secondsCovered: z.number()
	}),
	histogram: z.object({ edges: z.array(z.number()), counts: z.array(z.number().int()) }),
	xy: z
		.object({ x: z.array(z.number()), y: z.array(z.number()), total: z.number().int() })
		.nullable()
});
export type SpanResponse = z.infer<typeof spanResponseSchema>;

export const derivedExportQuerySchema = z.object({
	decode: recordId,
	kind: z.enum(['long', 'wide'], { error: 'kind must be long or wide' }),
	interval: decimal('interval')
		.pipe(z.number().positive('interval must be more than 0 seconds'))
		.default(0.1),
	mode: z.enum(['last', 'mean'], { error: 'mode must be last or mean' }).default('last'),
	/** The derived channels as JSON: `[{ "name", "unit", "formula" }, …]`. */
	derived: z
		.string()
		.transform((text, ctx) => {
			try {
				return JSON.parse(text) as unknown;
			} catch {
				ctx.addIssue({ code: 'custom', message: 'derived must be a JSON list of channels' });
				return z.NEVER;
			}
		})
		.pipe(
			z.array(derivedDefinitionSchema).min(1, 'name at least one derived channel').max(MAX_DERIVED)
		)
});
export type DerivedExportQuery = z.input<typeof derivedExportQuerySchema>;
