/**
 * The failure half of the JSON API contract: every route answers an expected failure with this body
 * and an HTTP status. Server (`Problem`, `apiRoute`) and browser (`ApiError`) both read it from here.
 */
import { z } from 'zod';

/** One thing wrong with a request: the field (or file line) and what to do about it. */
export const issueSchema = z.object({
	/** Dotted field path (`frames.0.name`), a query parameter's name, or `(root)`. */
	path: z.string(),
	message: z.string(),
	/** Where in an imported text file the problem is (CSV line, JSON line/column). */
	line: z.number().int().optional(),
	column: z.union([z.number().int(), z.string()]).optional()
});
export type Issue = z.infer<typeof issueSchema>;

/** `{ error, issues? }`; a few failures add fields of their own (see `staleDraftProblemSchema`). */
export const problemBodySchema = z
	.looseObject({
		error: z.string(),
		issues: z.array(issueSchema).optional()
	})
	.meta({
		id: 'Problem',
		description:
			'A failure: what went wrong in words a person can act on, and for bad input each field (or file line) refused.'
	});
export type ProblemBody = z.infer<typeof problemBodySchema>;

/** The statuses an expected failure can have. */
export const ERROR_STATUSES = [400, 401, 403, 404, 409, 410, 413, 415, 422, 429] as const;
export type ErrorStatus = (typeof ERROR_STATUSES)[number];
