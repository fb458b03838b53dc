/**
 * The shape of a relink review — each link moved from map revision A to B (relink.ts) — apart
 * from how one is made: mathjs-free, so the API contract and the browser load it without the unit
 * machinery.
 */
import { z } from 'zod';
import { fieldChangeSchema } from '../map-diff';
import { candidateSchema } from './link-report-schema';
import { linkSchema } from './link-schema';
import { composedScalingSchema } from './scaling';

export const relinkStatusSchema = z.enum(['kept', 'changed', 'broken']);
export type RelinkStatus = z.infer<typeof relinkStatusSchema>;

export const relinkItemSchema = z.object({
	wanted: z.string(),
	status: relinkStatusSchema,
	before: linkSchema,
	/** The link as it would be on revision B; null when broken. */
	after: linkSchema.nullable(),
	/** Decoding fields of the signal that differ between A and B. */
	changes: z.array(fieldChangeSchema),
	/** How the device turns raw into its value, on A and on B (null where there is no signal). */
	scaling: z.object({
		before: composedScalingSchema.nullable(),
		after: composedScalingSchema.nullable()
	}),
	/** For a broken link: the signal of B most likely to be the old one under a new name. */
	suggestion: candidateSchema.extend({ evidence: z.string() }).nullable(),
	message: z.string()
});
export type RelinkItem = z.infer<typeof relinkItemSchema>;

export const relinkResultSchema = z.object({
	items: z.array(relinkItemSchema),
	counts: z.record(relinkStatusSchema, z.number().int())
});
export type RelinkResult = z.infer<typeof relinkResultSchema>;
