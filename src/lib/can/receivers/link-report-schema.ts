/**
 * The shape of a link report — what linking a profile to a map revision finds (linking.ts) —
 * apart from how one is made: mathjs-free, so the API contract and the browser load it without
 * the unit machinery.
 */
import { z } from 'zod';
import { linkSchema } from './link-schema';
import { conversionSchema } from './scaling';

export const candidateSchema = z.object({
	frame: z.string(),
	id: z.number().int(),
	extended: z.boolean(),
	signal: z.string(),
	frameIndex: z.number().int(),
	signalIndex: z.number().int(),
	/** 0…1: name score × unit factor; 0 when the units do not convert. */
	score: z.number(),
	nameScore: z.number(),
	/** For people: why the name matches and how the unit converts. */
	reason: z.string(),
	conversion: conversionSchema.nullable(),
	/** Why this signal cannot be linked (units that do not convert); null when it can. */
	problem: z.string().nullable()
});
export type Candidate = z.infer<typeof candidateSchema>;

export const linkedChannelSchema = z.object({
	wanted: z.string(),
	required: z.boolean(),
	link: linkSchema,
	reason: z.string(),
	/** The runners-up (and the chosen one), best first, for a person to compare. */
	candidates: z.array(candidateSchema)
});
export type LinkedChannel = z.infer<typeof linkedChannelSchema>;

export const unlinkedChannelSchema = z.object({
	wanted: z.string(),
	required: z.boolean(),
	reason: z.string(),
	candidates: z.array(candidateSchema)
});
export type UnlinkedChannel = z.infer<typeof unlinkedChannelSchema>;

export const linkProblemSchema = z.object({
	wanted: z.string(),
	/** Where in the profile file, e.g. `manualLinks[0].signal`. */
	path: z.string(),
	message: z.string()
});
export type LinkProblem = z.infer<typeof linkProblemSchema>;

export const linkReportSchema = z.object({
	profile: z.string(),
	map: z.string(),
	links: z.array(linkedChannelSchema),
	unlinked: z.array(unlinkedChannelSchema),
	/** Links fixed by hand that cannot be made; nothing of them is in `links`. */
	problems: z.array(linkProblemSchema)
});
export type LinkReport = z.infer<typeof linkReportSchema>;
