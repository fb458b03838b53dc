/**
 * What the decode, view and export routes of a capture accept, each shape defined once with zod.
 * Query strings arrive as text, so their numbers are parsed here with messages naming the parameter.
 */
import { z } from 'zod';
import { canIdSchema, MAX_EXTENDED_ID } from '../../can/map';

const recordId = (what: string) =>
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

const wholeNumber = (name: string, min: number, max: number) =>
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
	})
});
export type DecodeInput = z.infer<typeof decodeInputSchema>;

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
const hexId = z
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

/** The URL's query parameters as a plain object, the last value winning, empty values dropped. */
export function queryObject(url: URL): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of url.searchParams) if (v !== '') out[k] = v;
	return out;
}
