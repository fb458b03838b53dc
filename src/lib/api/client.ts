/**
 * The browser's side of the JSON API contract (`{ error, issues? }` on failure): one fetch wrapper that
 * every route's small client builds on, so each failure becomes an ApiError a person can read.
 */
import type { Issue as ApiIssue } from '$lib/server/problem';

export type { ApiIssue };

export class ApiError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly issues: ApiIssue[] = [],
		/** The whole error body, for routes that send more than `{ error, issues }` (e.g. a 409's current version). */
		readonly body: Record<string, unknown> = {}
	) {
		super(message);
		this.name = 'ApiError';
	}
}

/** Words for a status whose answer carries no message of its own (e.g. a proxy error page). */
export type FallbackMessages = Partial<Record<number, string>>;

const commonFallbacks: FallbackMessages = {
	400: 'Some of the values were not accepted.',
	401: 'Your session has ended. Sign in again to continue.',
	403: 'Your role in this workspace does not allow that.'
};

/** Sends JSON (when `body` is given) and returns the parsed answer; 204 resolves to undefined. */
export async function requestJson<T>(
	fetcher: typeof fetch,
	method: string,
	url: string,
	body?: unknown,
	fallbacks: FallbackMessages = {}
): Promise<T> {
	let response: Response;
	try {
		response = await fetcher(url, {
			method,
			headers: body === undefined ? undefined : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		throw new ApiError(0, 'The server could not be reached. Check your connection and try again.');
	}
	if (response.status === 204) return undefined as T;
	const payload: unknown = await response.json().catch(() => null);
	if (!response.ok) {
		const p = (payload && typeof payload === 'object' ? payload : {}) as Record<string, unknown>;
		const message =
			typeof p.error === 'string' && p.error
				? p.error
				: (fallbacks[response.status] ??
					commonFallbacks[response.status] ??
					`The server answered ${response.status}.`);
		throw new ApiError(
			response.status,
			message,
			Array.isArray(p.issues) ? (p.issues as ApiIssue[]) : [],
			p
		);
	}
	return payload as T;
}

/** Field messages of a 400 answer, keyed by the field path (`issues[].path`). */
export function fieldIssues(error: unknown): Record<string, string[]> {
	const out: Record<string, string[]> = {};
	if (error instanceof ApiError) for (const i of error.issues) (out[i.path] ??= []).push(i.message);
	return out;
}

export function messageOf(error: unknown): string {
	return error instanceof Error ? error.message : 'Something went wrong. Please try again.';
}
