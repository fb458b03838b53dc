/**
 * How the contract describes one route: method, path template, access, the schemas of its
 * parameters, query, body and answer, and its failures. `endpoints.ts` lists every route this
 * way, so a client, the route tests and generated documentation read one description.
 */
import type { z } from 'zod';
import type { Role } from '../roles';
import { problemBodySchema, type ErrorStatus } from './problem';

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/** Who may call: anyone with the link, any signed-in person, or a member with at least this role. */
export type Access = 'public' | 'signed-in' | Role;

/** A failure: what it means for this route (also the words a client shows when a body is missing). */
export interface ErrorSpec {
	description: string;
	/** The body, when it carries more than `{ error, issues? }`. */
	body: z.ZodType;
}

export interface EndpointDef {
	method: Method;
	/** Path template with `{name}` parameters, e.g. `/api/workspaces/{ws}/maps/{mapId}`. */
	path: `/${string}`;
	summary: string;
	access: Access;
	query?: z.ZodType;
	/** A JSON body, or `binary` for a raw file upload (the capture upload). */
	body?: z.ZodType | 'binary';
	status: 200 | 201 | 202 | 204;
	/** The JSON answer; absent for 204 and for downloads. */
	response?: z.ZodType;
	/** A file download instead of JSON (`content-type` of the file). */
	download?: string;
	errors: Partial<Record<ErrorStatus, ErrorSpec>>;
}

/** The path parameters of a template: `'/a/{ws}/b/{id}'` → `'ws' | 'id'`. */
export type PathParams<P extends string> = P extends `${string}{${infer N}}${infer Rest}`
	? N | PathParams<Rest>
	: never;

/** `{ 404: 'words' }` or `{ 409: ['words', schema] }` → ErrorSpecs with the default body. */
export function errors(
	specs: Partial<Record<ErrorStatus, string | [string, z.ZodType]>>
): Partial<Record<ErrorStatus, ErrorSpec>> {
	const out: Partial<Record<ErrorStatus, ErrorSpec>> = {};
	for (const [status, spec] of Object.entries(specs)) {
		if (spec === undefined) continue;
		out[Number(status) as ErrorStatus] =
			typeof spec === 'string'
				? { description: spec, body: problemBodySchema }
				: { description: spec[0], body: spec[1] };
	}
	return out;
}

/** The failures the guard itself answers for a route of this access. */
export function guardErrors(access: Access): Partial<Record<ErrorStatus, string>> {
	if (access === 'public') return {};
	const signedIn = {
		401: 'Your session has ended (or the access token is mistyped, revoked or expired). Sign in again to continue.'
	};
	if (access === 'signed-in') return signedIn;
	return {
		...signedIn,
		...(access === 'viewer' ? {} : { 403: 'Your role in this workspace does not allow that.' }),
		404: 'That workspace does not exist, or you are not a member of it (or the access token is for another workspace).'
	};
}

/** One endpoint: the guard's failures are added from `access`; the route's own come after (and win). */
export function endpoint<const D extends Omit<EndpointDef, 'errors'>>(
	def: D,
	own: Partial<Record<ErrorStatus, string | [string, z.ZodType]>> = {}
): D & { errors: Partial<Record<ErrorStatus, ErrorSpec>> } {
	// Every route with a body has a size limit (src/lib/server/http/body-limits.ts).
	const tooLarge = def.body ? { 413: 'The request is larger than this route accepts.' } : {};
	return { ...def, errors: errors({ ...guardErrors(def.access), ...tooLarge, ...own }) };
}

/** Fills a path template: `{name}` → the URL-encoded parameter. */
export function fillPath(template: string, params: Record<string, string | number>): string {
	return template.replace(/\{(\w+)\}/g, (_, name: string) => {
		const value = params[name];
		if (value === undefined) throw new Error(`Missing path parameter "${name}" for ${template}`);
		return encodeURIComponent(String(value));
	});
}

/** A query object as a URL query string (`?a=1&b=x`); undefined and null values are left out. */
export function queryString(query: Record<string, unknown> | undefined): string {
	if (!query) return '';
	const q = new URLSearchParams();
	for (const [k, v] of Object.entries(query))
		if (v !== undefined && v !== null) q.set(k, String(v));
	const s = q.toString();
	return s ? `?${s}` : '';
}
