import { json, type RequestEvent } from '@sveltejs/kit';
import type { z } from 'zod';
import { parseOrProblem, Problem } from './problem';

/** Wraps a JSON route handler so expected failures become `{ error, issues? }` with their status. */
export function apiRoute<E extends RequestEvent>(handler: (event: E) => Promise<Response>) {
	return async (event: E): Promise<Response> => {
		try {
			return await handler(event);
		} catch (thrown) {
			if (thrown instanceof Problem) {
				const body = {
					error: thrown.message,
					...(thrown.issues ? { issues: thrown.issues } : {}),
					...thrown.extra
				};
				return json(body, { status: thrown.status });
			}
			throw thrown;
		}
	};
}

export async function readJsonBody<S extends z.ZodType>(
	request: Request,
	schema: S
): Promise<z.infer<S>> {
	let body: unknown;
	try {
		body = await request.json();
	} catch {
		throw new Problem(400, 'The request body must be JSON.', [
			{ path: '(root)', message: 'Invalid JSON' }
		]);
	}
	return parseOrProblem(schema, body);
}

export function noContent(): Response {
	return new Response(null, { status: 204 });
}
