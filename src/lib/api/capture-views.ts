/**
 * The contract of a processed capture's decode, view and export routes. Query strings arrive as
 * text, so their numbers are parsed here with messages naming the parameter.
 */
import { z } from 'zod';
import { alertReplaySchema as libraryAlertReplaySchema } from '../can/alerts/replay';
import { dm1LampsSchema } from '../can/j1939';
import { canIdSchema, MAX_EXTENDED_ID, signalRoleSchema } from '../can/map';
import { captureBitrateSchema, decodeRecordSchema } from './captures';
import type { ValuePrecision } from '../value-format';
import { named } from './shapes';

export const recordId = (what: string) =>
	z
		.string({ error: `give the ${what} id` })
		.trim()
		.min(1, `give the ${what} id`)
		.max(100, `that is too long to be a ${what} id`);

/** A decimal number from a query string (an empty value counts as absent). */
const decimal = (name: string) =>
	z
		.string()
		.trim()
		.regex(/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/, `${name} must be a number`)
		.transform(Number)
		.pipe(z.number().refine(Number.isFinite, `${name} must be a finite number`));

export const wholeNumber = (name: string, min: number, max: number) =>
	z
		.string()
		.trim()
		.regex(/^\d{1,9}$/, `${name} must be a whole number`)
		.transform(Number)
		.pipe(
			z
				.number()
				.min(min, `${name} must be at least ${min}`)
				.max(max, `${name} must be at most ${max}`)
		);

export const decodeInputSchema = z.strictObject({
	mapId: recordId('map'),
	revision: z.union([z.number().int().min(1), z.literal('draft')], {
		error: 'revision must be a revision number (1, 2, …) or "draft"'
	}),
	/** Decode one bus of a capture of several (its index in the report's `buses`); absent or null: every bus. */
	bus: z
		.number({ error: 'bus must be a bus number (0, 1, …) or null for every bus' })
		.int('bus must be a bus number (0, 1, …) or null for every bus')
		.min(0, 'bus must be a bus number (0, 1, …) or null for every bus')
		.max(255, 'a capture has at most 256 buses (0–255)')
		.nullable()
		.optional()
});
export type DecodeInput = z.infer<typeof decodeInputSchema>;
/** What to decode with: a revision number, or the map's working draft. */
export type DecodeRevision = DecodeInput['revision'];

/** Most points a series request may ask for: a very wide screen at twice its pixel count. */
export const MAX_SERIES_POINTS = 10_000;

export const seriesQuerySchema = z
	.object({
		decode: recordId('decode'),
		channel: wholeNumber('channel', 0, 1_000_000),
		from: decimal('from').optional(),
		to: decimal('to').optional(),
		points: wholeNumber('points', 1, MAX_SERIES_POINTS).default(2000)
	})
	.refine((q) => q.from === undefined || q.to === undefined || q.from <= q.to, {
		path: ['to'],
		message: 'to must not be before from'
	});

export const MAX_FRAMES_PAGE = 1000;

/** An ID in hex as typed in a filter box: "0x5F0", "5f0" or "18FECA00". */
export const hexId = z
	.string()
	.trim()
	.regex(/^(0[xX])?[0-9a-fA-F]{1,8}$/, 'id must be a hex CAN ID like 5F0 or 0x18FECA00')
	.transform((s) => Number.parseInt(s.replace(/^0[xX]/, ''), 16))
	.pipe(z.number().max(MAX_EXTENDED_ID, 'id must be at most 0x1FFFFFFF'));

export const framesQuerySchema = z.object({
	offset: wholeNumber('offset', 0, 4_000_000_000).default(0),
	limit: wholeNumber('limit', 1, MAX_FRAMES_PAGE).default(100),
	id: hexId.optional(),
	/** With `id`: only standard (0) or only extended (1) frames of that ID; both when absent. */
	extended: z
		.enum(['0', '1'], { error: 'extended must be 0 or 1' })
		.transform((v) => v === '1')
		.optional()
});
export type FramesQuery = z.infer<typeof framesQuerySchema>;
export type SeriesQuery = z.infer<typeof seriesQuerySchema>;

export const frameDetailQuerySchema = z.object({
	index: wholeNumber('index', 0, 4_000_000_000),
	decode: recordId('decode')
});

export const defineFrameInputSchema = z
	.strictObject({
		decode: recordId('decode'),
		id: canIdSchema,
		extended: z.boolean({ error: 'extended must be true or false' })
	})
	.refine((d) => d.extended || d.id <= 0x7ff, {
		path: ['id'],
		message: 'a standard (11-bit) ID is at most 0x7FF'
	});
export type DefineFrameInput = z.infer<typeof defineFrameInputSchema>;

export const exportQuerySchema = z
	.object({
		kind: z.enum(['long', 'wide', 'frames'], { error: 'kind must be long, wide or frames' }),
		decode: recordId('decode').optional(),
		interval: decimal('interval')
			.pipe(z.number().positive('interval must be more than 0 seconds'))
			.default(0.1),
		mode: z.enum(['last', 'mean'], { error: 'mode must be last or mean' }).default('last')
	})
	.refine((q) => q.kind === 'frames' || q.decode !== undefined, {
		path: ['decode'],
		message: 'a decoded export needs the decode id (decode=…)'
	});
export type ExportQuery = z.input<typeof exportQuerySchema>;
export type ExportKind = z.infer<typeof exportQuerySchema>['kind'];

// ---- answers ----

export const valuePrecisionSchema = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('decimals'), decimals: z.number().int().min(0).max(20) }),
	z.object({ kind: z.literal('float32') }),
	z.object({ kind: z.literal('float64') }),
	z.object({ kind: z.literal('computed') })
]) satisfies z.ZodType<ValuePrecision>;

/** Per channel of a decode: its statistics (samples are fetched through the series route). */
export const channelSummarySchema = z.object({
	index: z.number().int(),
	frameName: z.string(),
	signalName: z.string(),
	unit: z.string(),
	count: z.number().int(),
	min: z.number().nullable(),
	max: z.number().nullable(),
	mean: z.number().nullable(),
	last: z.number().nullable(),
	/** Samples outside [limitMin, limitMax] (the signal's min/max in the map). */
	outOfRange: z.number().int(),
	limitMin: z.number().nullable(),
	limitMax: z.number().nullable(),
	/** Samples a J1939 sender flagged as "not available" / "error" (SAE J1939-71 ranges). */
	notAvailable: z.number().int(),
	errors: z.number().int(),
	/** How its values print: the decimals its scale allows (src/lib/value-format.ts). */
	precision: valuePrecisionSchema.optional(),
	/** What the signal carries (docs/map-format.md, "Signal roles"); decodes stored before roles read as value. */
	role: signalRoleSchema.default('value')
});
export type ChannelSummary = z.infer<typeof channelSummarySchema>;

export const idSummarySchema = z.object({
	/** The bus it was seen on: index into the capture report's `buses` (0 without a bus column). */
	bus: z.number().int().min(0).default(0),
	id: z.number().int(),
	extended: z.boolean(),
	/** The map frame's name, null for an ID the map does not define. */
	name: z.string().nullable(),
	count: z.number().int(),
	rateHz: z.number().nullable(),
	meanPeriodMs: z.number().nullable(),
	jitterMs: z.number().nullable(),
	/** The cycle time the map promises, to compare with meanPeriodMs. */
	cycleMs: z.number().nullable(),
	minLength: z.number().int(),
	maxLength: z.number().int()
});
export type IdSummary = z.infer<typeof idSummarySchema>;

export const unknownIdSummarySchema = z.object({
	/** The bus it was seen on: index into the capture report's `buses` (0 without a bus column). */
	bus: z.number().int().min(0).default(0),
	id: z.number().int(),
	extended: z.boolean(),
	count: z.number().int(),
	rateHz: z.number().nullable(),
	maxLength: z.number().int(),
	/** bitChanges[b]: changes of payload bit b (docs/bit-numbering.md) between consecutive frames. */
	bitChanges: z.array(z.number().int())
});
export type UnknownIdSummary = z.infer<typeof unknownIdSummarySchema>;

export const troubleCodeSummarySchema = z.object({
	/** When this (source, SPN, FMI) was first reported; lastTime when last. */
	time: z.number(),
	lastTime: z.number(),
	sourceAddress: z.number().int(),
	spn: z.number().int(),
	fmi: z.number().int(),
	occurrenceCount: z.number().int(),
	/** Lamp states of the latest DM1 that reported it. */
	lamps: named(
		dm1LampsSchema,
		'Dm1Lamps',
		'The four DM1 lamps, each { state, flash } (SAE J1939-73).'
	)
});
export type TroubleCodeSummary = z.infer<typeof troubleCodeSummarySchema>;

export const j1939SummarySchema = z.object({
	troubleCodes: z.array(troubleCodeSummarySchema),
	/** Reassembled transport messages: BAM (destination 0xFF, global) and RTS/CTS (destination = responder). */
	messages: z.array(
		z.object({
			time: z.number(),
			mode: z.enum(['bam', 'rts-cts']),
			pgn: z.number().int(),
			sourceAddress: z.number().int(),
			destinationAddress: z.number().int(),
			length: z.number().int(),
			dataHex: z.string()
		})
	)
});
export type J1939Summary = z.infer<typeof j1939SummarySchema>;

/** Everything of one decode except the sample arrays; NaN and ±Infinity become null. */
export const decodeSummarySchema = z.object({
	frameCount: z.number().int(),
	durationS: z.number(),
	bitrate: z.number(),
	channels: z.array(channelSummarySchema),
	ids: z.array(idSummarySchema),
	unknownIds: z.array(unknownIdSummarySchema),
	busLoad: z.array(z.object({ start: z.number(), percent: z.number() })),
	j1939: j1939SummarySchema.nullable()
});
export type DecodeSummary = z.infer<typeof decodeSummarySchema>;

/** The body of the decode routes (POST …/decode and GET …/decodes/{decodeId}). */
export const decodeResponseSchema = z.object({
	decode: decodeRecordSchema,
	summary: decodeSummarySchema
});
export type DecodeResponse = z.infer<typeof decodeResponseSchema>;

export const frameRowSchema = z.object({
	index: z.number().int(),
	/** Seconds from the capture's first frame. */
	time: z.number(),
	id: z.number().int(),
	extended: z.boolean(),
	length: z.number().int(),
	/** Payload as spaced upper-case hex bytes. */
	dataHex: z.string(),
	/** Index into the capture report's `buses` (0 without a bus column). */
	bus: z.number().int().min(0).default(0),
	/** Received by the logger, or sent by it (a direction column's `Tx`). */
	direction: z.enum(['rx', 'tx']).default('rx')
});
export type FrameRow = z.infer<typeof frameRowSchema>;

/** One page of raw frames in capture order; `total` counts every frame the filter lets through. */
export const framesResponseSchema = z.object({
	total: z.number().int(),
	frames: z.array(frameRowSchema)
});
export type FramesResponse = z.infer<typeof framesResponseSchema>;

export const frameSignalRowSchema = z.object({
	name: z.string(),
	/** Integer raw value (as a decimal string when beyond 2^53), the IEEE 754 value of a float; null when absent. */
	raw: z.union([z.number(), z.string()]).nullable(),
	value: z.number().nullable(),
	unit: z.string(),
	label: z.string().nullable(),
	/** false when the signal is not in this frame (another mux page, or past the received payload). */
	present: z.boolean(),
	inRange: z.boolean().nullable(),
	/** What the signal carries (docs/map-format.md, "Signal roles"). */
	role: signalRoleSchema.default('value')
});
export type FrameSignalRow = z.infer<typeof frameSignalRowSchema>;

export const frameDetailSchema = z.object({
	frame: frameRowSchema.extend({ frameName: z.string().nullable() }),
	signals: z.array(frameSignalRowSchema)
});
export type FrameDetail = z.infer<typeof frameDetailSchema>;

/** One channel over a time range, min/max-decimated (null stands for a non-finite float value). */
export const seriesResponseSchema = z.object({
	channel: z.object({
		index: z.number().int(),
		frameName: z.string(),
		signalName: z.string(),
		unit: z.string()
	}),
	/** Seconds from the capture's first frame. */
	time: z.array(z.number()),
	value: z.array(z.number().nullable()),
	/** true when min/max per bucket thinned the samples; false when every sample in the range is here. */
	decimated: z.boolean(),
	/** Samples of the channel inside [from, to]. */
	samplesInRange: z.number().int()
});
export type SeriesResponse = z.infer<typeof seriesResponseSchema>;

/** "Define this frame": where the new frame landed in the decode's map draft. */
export const definedFrameResponseSchema = z.object({
	mapId: z.string(),
	/** The draft's version after the change. */
	version: z.number().int(),
	frameIndex: z.number().int()
});
export type DefinedFrameResponse = z.infer<typeof definedFrameResponseSchema>;

/** The 409 when the draft already defines the ID: which frame does. */
export const frameExistsProblemSchema = z.looseObject({
	error: z.string(),
	frameIndex: z.number().int()
});

export const alertReplaySchema = named(
	libraryAlertReplaySchema,
	'AlertReplay',
	'Alert rules of the decode’s map replayed over its channels: the rules, their events and a summary per rule.'
);

/** GET …/bus-load: one load-over-time per bus, at the capture's own bit rates (docs/capture-csv.md). */
export const captureBusLoadResponseSchema = z.object({
	bitrate: captureBitrateSchema,
	windowSeconds: z.number(),
	buses: z.array(
		z.object({
			bus: z.number().int(),
			/** The bus as the file named it ('' for the one bus of a capture without a bus column). */
			name: z.string(),
			frames: z.number().int(),
			fdFrames: z.number().int(),
			meanPercent: z.number(),
			peakPercent: z.number(),
			windows: z.array(z.object({ start: z.number(), percent: z.number() }))
		})
	)
});
export type CaptureBusLoadResponse = z.infer<typeof captureBusLoadResponseSchema>;
