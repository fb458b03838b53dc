/**
 * Helpers every route uses: the JSON route wrapper, reading a JSON body or a query string through
 * the contract's schemas (`$lib/api`), and turning an expected failure into a page's error.
 */
import { error, json, type RequestEvent } from '@sveltejs/kit';
import type { z } from 'zod';
import { parseOrProblem, Problem } from './problem';

/** Wraps a JSON route handler so expected failures become `{ error, issues? }` with their status. */
export function apiRoute<E extends RequestEvent>(handler: (event: E) => Promise<Response>) {
	return async (event: E): Promise<Response> => {
		try {
			return await handler(event);
		} catch (thrown) {
			if (thrown instanceof Problem) return json(thrown.body(), { status: thrown.status });
			throw thrown;
		}
	};
}

export async function readJsonBody<S extends z.ZodType>(
	request: Request,
	schema: S
): Promise<z.output<S>> {
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

/** The URL's query parameters as a plain object, the last value winning, empty values dropped. */
export function queryObject(url: URL): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [k, v] of url.searchParams) if (v !== '') out[k] = v;
	return out;
}

/** The query string parsed by the endpoint's schema; a 400 names each bad parameter. */
export function readQuery<S extends z.ZodType>(url: URL, schema: S): z.output<S> {
	return parseOrProblem(schema, queryObject(url), 'The query has invalid parameters.');
}

export function noContent(): Response {
	return new Response(null, { status: 204 });
}

/** Loads and page endpoints show the error page for an expected failure instead of a 500. */
export async function orPageError<T>(work: Promise<T> | (() => Promise<T>)): Promise<T> {
	try {
		return await (typeof work === 'function' ? work() : work);
	} catch (thrown) {
		if (thrown instanceof Problem) error(thrown.status, thrown.message);
		throw thrown;
	}
}
