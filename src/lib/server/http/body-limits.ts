/**
 * Request body limits, per kind of route, enforced before a handler reads the body.
 *
 * adapter-node has one limit for every route (`BODY_SIZE_LIMIT`), and the capture upload needs
 * up to `CAPTURE_MAX_BYTES`, so `npm start` lifts it and this hook does the job per route:
 * a declared `Content-Length` over the limit is answered 413 without reading; a body without one
 * is counted as the handler reads it and cut off at the limit (413 again, never an echo of what was
 * sent). Whatever a handler leaves unread — a refused upload, a request answered 401 before its
 * body mattered — is read and thrown away before the answer goes out, so the browser finishes
 * sending and shows the message instead of a reset connection. A rest too long to drain is not
 * read; the answer then closes the connection.
 *
 * | kind                                         | limit     | why                                           |
 * | -------------------------------------------- | --------- | --------------------------------------------- |
 * | capture upload (POST …/captures)             | route's   | streams to storage, `CAPTURE_MAX_BYTES`       |
 * | map import (POST …/maps)                     | 12 MiB    | a 5 MB file, JSON-escaped inside the request  |
 * | draft save (PUT …/maps/{id}/draft)           | 5 MiB     | as large as an imported map                   |
 * | other JSON API routes                        | 1 MiB     | rules, queries, names: kilobytes in practice  |
 * | sign-in form (POST /signin)                  | 8 KiB     | an address (≤ 254) and a local callback path  |
 * | other forms, sign-out, Auth.js, anything else | 64 KiB    | notes of 2000 characters, percent-encoded     |
 */
import { json, type Handle, type RequestEvent } from '@sveltejs/kit';
import { formatBytes } from '../storage/storage';

const KiB = 1024;
const MiB = 1024 * KiB;

export type BodyKind = 'capture-upload' | 'map-import' | 'draft' | 'json-api' | 'sign-in' | 'form';

/** Bytes each kind of route accepts; the capture upload's is the configured capture limit. */
export const BODY_LIMITS: Record<Exclude<BodyKind, 'capture-upload'>, number> = {
	'map-import': 12 * MiB,
	draft: 5 * MiB,
	'json-api': 1 * MiB,
	'sign-in': 8 * KiB,
	form: 64 * KiB
};

/** Bytes of an unread rest thrown away before answering; past this the connection is closed instead. */
export const DRAIN_BYTES = 16 * MiB;

export function bodyKind(method: string, routeId: string | null): BodyKind {
	if (method === 'POST' && routeId === '/api/workspaces/[ws]/captures') return 'capture-upload';
	if (method === 'POST' && routeId === '/api/workspaces/[ws]/maps') return 'map-import';
	if (method === 'PUT' && routeId === '/api/workspaces/[ws]/maps/[mapId]/draft') return 'draft';
	if (routeId?.startsWith('/api/')) return 'json-api';
	if (routeId === '/signin') return 'sign-in';
	return 'form';
}

export interface BodyRule {
	kind: BodyKind;
	/** Largest body accepted; null when the route enforces its own limit while streaming. */
	limit: number | null;
	/** Largest unread rest drained before answering. */
	drain: number;
}

export function bodyRule(
	method: string,
	routeId: string | null,
	captureMaxBytes: number
): BodyRule {
	const kind = bodyKind(method, routeId);
	if (kind === 'capture-upload') return { kind, limit: null, drain: captureMaxBytes };
	return { kind, limit: BODY_LIMITS[kind], drain: DRAIN_BYTES };
}

/** The request's declared body length, or null without a (valid) Content-Length. */
function declaredLength(headers: Headers): number | null {
	const value = headers.get('content-length');
	if (value === null || !/^\d+$/.test(value.trim())) return null;
	return Number(value);
}

/** Thrown into a handler that reads past the limit (the hook answers 413 whatever it made of it). */
export class BodyTooLargeError extends Error {
	constructor(readonly limit: number) {
		super(`The request body is larger than ${formatBytes(limit)}.`);
	}
}

export interface GuardedBody {
	/** The request to hand on: same method, URL and headers, the body counted as it is read. */
	request: Request;
	/** True once more than the limit has arrived. */
	readonly exceeded: boolean;
	/**
	 * Reads and discards what the handler left unread, up to `drain` bytes. True when the body was
	 * read to its end (the connection can stay open), false when the rest was too long.
	 */
	settle(): Promise<boolean>;
}

/**
 * Wraps a request's body so that reading past `limit` fails with BodyTooLargeError, and so that a
 * handler giving up on the body (cancelling it) leaves the underlying stream for `settle` to drain
 * instead of destroying the connection (which is what cancelling adapter-node's stream does).
 */
export function guardBody(request: Request, limit: number | null, drain: number): GuardedBody {
	if (request.body === null) {
		return { request, exceeded: false, settle: async () => true };
	}
	const source = request.body.getReader();
	const declared = declaredLength(request.headers);
	let received = 0;
	let ended = false;
	let exceeded = false;
	let abandoned = false;
	const body = new ReadableStream<Uint8Array>({
		async pull(controller) {
			const chunk = await source.read();
			if (chunk.done) ended = true;
			else received += chunk.value.byteLength;
			if (abandoned) return;
			if (chunk.done) controller.close();
			else if (limit !== null && received > limit) {
				exceeded = true;
				controller.error(new BodyTooLargeError(limit));
			} else controller.enqueue(chunk.value);
		},
		cancel() {
			abandoned = true; // the rest stays in `source`, for settle()
		}
	});
	return {
		request: new Request(request, { body, duplex: 'half' } as RequestInit),
		get exceeded() {
			return exceeded;
		},
		async settle() {
			if (ended) return true;
			if (declared !== null && declared - received > drain) return false;
			let drained = 0;
			try {
				for (;;) {
					const chunk = await source.read();
					if (chunk.done) return (ended = true);
					drained += chunk.value.byteLength;
					if (drained > drain) return false;
				}
			} catch {
				return false; // the client went away
			}
		}
	};
}

/** The 413 answer, in the shape the caller reads: API problem JSON, an action result, or text. */
export function tooLargeResponse(
	event: Pick<RequestEvent, 'url' | 'request'>,
	limit: number
): Response {
	const message = `The request is larger than ${formatBytes(limit)}, the most this address accepts; nothing was read or saved.`;
	if (event.url.pathname.startsWith('/api/')) {
		return json({ error: message, maxBytes: limit }, { status: 413 });
	}
	// An enhanced form (`use:enhance`) asks for JSON and reads an ActionResult.
	if (/application\/json/.test(event.request.headers.get('accept') ?? '')) {
		return json({ type: 'error', status: 413, error: { message } }, { status: 413 });
	}
	return new Response(message, {
		status: 413,
		headers: { 'content-type': 'text/plain; charset=utf-8' }
	});
}

/** A response that closes the connection after it is sent (its headers may be immutable). */
function closing(response: Response): Response {
	const copy = new Response(response.body, response);
	copy.headers.set('connection', 'close');
	return copy;
}

/** The hook: limits from `bodyRule`, the capture limit from the request's services. */
export const limitRequestBodies: Handle = async ({ event, resolve }) => {
	const rule = bodyRule(
		event.request.method,
		event.route.id,
		event.locals.services.config.captureMaxBytes
	);
	const declared = declaredLength(event.request.headers);
	const guard = guardBody(event.request, rule.limit, rule.drain);
	if (rule.limit !== null && declared !== null && declared > rule.limit) {
		const refusal = tooLargeResponse(event, rule.limit);
		return (await guard.settle()) ? refusal : closing(refusal);
	}
	event.request = guard.request;
	let response = await resolve(event);
	if (guard.exceeded && rule.limit !== null) response = tooLargeResponse(event, rule.limit);
	return (await guard.settle()) ? response : closing(response);
};
