/**
 * The browser's side of the API contract: one typed call for every endpoint in `endpoints.ts`.
 * Parameters, query, body and answer are typed from the endpoint's schemas; every failure becomes an
 * ApiError a person can read (the server's own message, else the contract's words for the status).
 */
import {
	endpoints,
	endpointUrl,
	type CallInput,
	type EndpointName,
	type ParamsOf,
	type QueryOf,
	type ResponseOf
} from './endpoints';
import type { Issue } from './problem';

export { endpointUrl, type CallInput, type ResponseOf };

type Args<I> = object extends I ? [input?: I] : [input: I];

export type ApiIssue = Issue;

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
async function requestJson<T>(
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

// ---- typed calls ----

/** Words for each failure status of this endpoint, from the contract. */
function fallbacksOf(name: EndpointName): FallbackMessages {
	const out: FallbackMessages = {};
	for (const [status, spec] of Object.entries(endpoints[name].errors))
		if (spec) out[Number(status)] = spec.description;
	return out;
}

/** Calls one endpoint of the contract. */
export function callApi<K extends EndpointName>(
	name: K,
	input: CallInput<K>,
	fetcher: typeof fetch = fetch
): Promise<ResponseOf<K>> {
	const { signal, body } = input as { signal?: AbortSignal; body?: unknown };
	const send: typeof fetch = signal ? (url, init) => fetcher(url, { ...init, signal }) : fetcher;
	return requestJson<ResponseOf<K>>(
		send,
		endpoints[name].method,
		endpointUrl(name, input as { params?: ParamsOf<K>; query?: QueryOf<K> }),
		body,
		fallbacksOf(name)
	);
}

/**
 * `callApi` for one workspace: the `{ws}` parameter is filled in, e.g.
 * `api('maps.saveDraft', { params: { mapId }, body: { version, draft } })`.
 */
export function workspaceApi(slug: string, fetcher: typeof fetch = fetch) {
	return <K extends EndpointName>(
		name: K,
		...[input]: Args<CallInput<K, Omit<ParamsOf<K>, 'ws'>>>
	): Promise<ResponseOf<K>> =>
		callApi(
			name,
			{ ...input, params: { ...input?.params, ws: slug } } as unknown as CallInput<K>,
			fetcher
		);
}

export type WorkspaceApi = ReturnType<typeof workspaceApi>;

/** Field messages of a 400 answer, keyed by the field path (`issues[].path`). */
export function fieldIssues(error: unknown): Record<string, string[]> {
	const out: Record<string, string[]> = {};
	if (error instanceof ApiError) for (const i of error.issues) (out[i.path] ??= []).push(i.message);
	return out;
}

export function messageOf(error: unknown): string {
	return error instanceof Error ? error.message : 'Something went wrong. Please try again.';
}

/** True for the 409 a stale draft save or publish gets; the page offers a reload instead of retrying. */
export function isStale(error: unknown): boolean {
	return error instanceof ApiError && error.status === 409;
}
