import { z } from 'zod';

export interface Issue {
	path: string;
	message: string;
	/** Where in an imported text file the problem is (CSV line, JSON line/column). */
	line?: number;
	column?: number | string;
}

/** An expected failure with an HTTP status, reported to API clients as `{ error, issues? }`. */
export class Problem extends Error {
	constructor(
		readonly status: 400 | 401 | 403 | 404 | 409 | 410 | 413 | 415 | 422,
		message: string,
		readonly issues?: Issue[],
		/** More fields for the JSON body, e.g. `currentVersion` on a stale save. */
		readonly extra?: Record<string, unknown>
	) {
		super(message);
		this.name = 'Problem';
	}
}

export function issuesOf(error: z.ZodError): Issue[] {
	return error.issues.map((i) => ({
		path: i.path.map(String).join('.') || '(root)',
		message: i.message
	}));
}

/** Field errors in the `{ field: string[] }` shape form actions return with `fail(400, …)`. */
export function fieldErrorsOf(error: z.ZodError): Record<string, string[]> {
	const errors: Record<string, string[]> = {};
	for (const issue of error.issues) {
		const key = issue.path.map(String).join('.') || 'form';
		(errors[key] ??= []).push(issue.message);
	}
	return errors;
}

export function parseOrProblem<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
	const result = schema.safeParse(input);
	if (!result.success)
		throw new Problem(400, 'The request has invalid fields.', issuesOf(result.error));
	return result.data;
}
