/**
 * A stored link: a wanted channel tied to a frame · signal of one map revision, with its
 * conversion. The shape only (mathjs-free, for the browser and the API contract); finding and
 * scoring links is linking.ts.
 */
import { z } from 'zod';
import { canIdSchema } from '../map';
import { conversionSchema } from './scaling';

export const linkSchema = z.strictObject({
	wanted: z.string().trim().min(1, 'name the wanted channel'),
	frame: z.string().trim().min(1, 'name the frame').describe("the frame's name in the revision"),
	id: canIdSchema,
	extended: z.boolean(),
	signal: z.string().trim().min(1, 'name the signal'),
	conversion: conversionSchema,
	confidence: z
		.number()
		.min(0, 'confidence is 0…1')
		.max(1, 'confidence is 0…1')
		.describe('the score the link was chosen with; 1 for a link made by hand'),
	manual: z.boolean().default(false).describe('made or confirmed by a person')
});
export type Link = z.output<typeof linkSchema>;
export type LinkInput = z.input<typeof linkSchema>;

/** "Frame · Signal", as people read a link. */
export const channelText = (frame: string, signal: string) => `${frame} · ${signal}`;
