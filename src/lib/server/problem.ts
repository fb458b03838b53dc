import type { z } from 'zod';
import type { ErrorStatus, Issue, ProblemBody } from '../api/problem';

/** An expected failure with an HTTP status, reported to API clients as `{ error, issues? }`. */
export class Problem extends Error {
	constructor(
		readonly status: ErrorStatus,
		message: string,
		readonly issues?: Issue[],
		/** More fields for the JSON body, e.g. `currentVersion` on a stale save. */
		readonly extra?: Record<string, unknown>
	) {
		super(message);
		this.name = 'Problem';
	}

	/** The JSON body of the contract's failure answer. */
	body(): ProblemBody {
		return {
			error: this.message,
			...(this.issues ? { issues: this.issues } : {}),
			...this.extra
		};
	}
}

export function issuesOf(error: z.ZodError): Issue[] {
	return error.issues.map((i) => ({
		path: i.path.map(String).join('.') || '(root)',
		message: i.message
	}));
}

/** The input parsed by the schema, or a 400 listing every field that was refused. */
export function parseOrProblem<S extends z.ZodType>(
	schema: S,
	input: unknown,
	message = 'The request has invalid fields.'
): z.output<S> {
	const result = schema.safeParse(input);
	if (!result.success) throw new Problem(400, message, issuesOf(result.error));
	return result.data;
}
