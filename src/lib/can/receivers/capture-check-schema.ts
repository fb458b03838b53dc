/**
 * The shape of a capture check — an installer's checklist of a linked profile on a decoded
 * capture (check.ts) — apart from how one is made: mathjs-free, so the API contract and the
 * browser load it without the unit machinery.
 */
import { z } from 'zod';

export const checkStatusSchema = z.enum(['pass', 'warning', 'fail']);
export type CheckStatus = z.infer<typeof checkStatusSchema>;
export const checkKindSchema = z.enum(['link', 'samples', 'interval', 'range', 'stuck']);
export type CheckKind = z.infer<typeof checkKindSchema>;

export const checkLineSchema = z.object({
	check: checkKindSchema,
	status: checkStatusSchema,
	sentence: z.string()
});
export type CheckLine = z.infer<typeof checkLineSchema>;

export const channelCheckSchema = z.object({
	wanted: z.string(),
	required: z.boolean(),
	/** The worst status of its lines. */
	status: checkStatusSchema,
	lines: z.array(checkLineSchema),
	samples: z.number().int(),
	/** Median time between samples, in milliseconds; null below two samples. */
	medianIntervalMs: z.number().nullable(),
	maxGapMs: z.number().nullable(),
	/** Share (0…1) of samples outside the display range; null without samples or range. */
	outsideShare: z.number().nullable()
});
export type ChannelCheck = z.infer<typeof channelCheckSchema>;

export const captureCheckSchema = z.object({
	channels: z.array(channelCheckSchema),
	counts: z.record(checkStatusSchema, z.number().int())
});
export type CaptureCheck = z.infer<typeof captureCheckSchema>;
