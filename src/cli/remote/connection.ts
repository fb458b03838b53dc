/**
 * The command line against a server (docs/cli.md, "Remote use"): `--server URL` and an access
 * token from FRAMEWRIGHT_TOKEN. Calls go through the typed
 * client of the API contract (src/lib/api/endpoints.ts), so URLs and shapes come from one place;
 * the token's workspace is asked of the server, so no command needs to name it.
 */
import { z } from 'zod';
import { ApiError, callApi, workspaceApi, type WorkspaceApi } from '../../lib/api/client';
import {
	endpointUrl,
	type EndpointName,
	type ParamsOf,
	type QueryOf
} from '../../lib/api/endpoints';
import type { WorkspaceSummary } from '../../lib/api/workspaces';
import { InputError, UsageError } from '../errors';

/** The `--server` option's value: an http(s) URL. */
export const serverOption = z
	.string()
	.trim()
	.refine(
		(s) => /^https?:\/\/[^\s/]+/i.test(s),
		'must be an http:// or https:// URL, like http://localhost:3000'
	)
	.optional();

export interface Remote {
	server: URL;
	workspace: WorkspaceSummary;
	/** Typed calls of the contract within the token's workspace. */
	api: WorkspaceApi;
	/** A raw request to an endpoint of the contract (downloads, the streamed upload). */
	request<K extends EndpointName>(
		name: K,
		input: { params?: Omit<ParamsOf<K>, 'ws'>; query?: QueryOf<K> },
		init?: RequestInit
	): Promise<Response>;
}

/** What a `--server` command reads from its option and the environment (the token). */
export function remoteSettings(
	server: string | undefined,
	env: NodeJS.ProcessEnv = process.env
): { server: URL; token: string } {
	if (!server) throw new UsageError('--server URL is required');
	const parsed = serverOption.safeParse(server);
	if (!parsed.success) throw new UsageError(`--server: ${parsed.error.issues[0].message}`);
	const token = env.FRAMEWRIGHT_TOKEN?.trim();
	if (!token)
		throw new UsageError(
			'set FRAMEWRIGHT_TOKEN to an access token (made on the workspace’s Access tokens page)'
		);
	return { server: new URL(parsed.data!.replace(/\/+$/, '') + '/'), token };
}

/** fetch against the server, with the token; paths of the contract are relative to the server. */
function authorisedFetch(server: URL, token: string, fetcher: typeof fetch): typeof fetch {
	return (input, init) => {
		const url = new URL(String(input).replace(/^\//, ''), server);
		const headers = new Headers(init?.headers);
		headers.set('authorization', `Bearer ${token}`);
		return fetcher(url, { ...init, headers });
	};
}

/** Connects: finds the token's workspace. A refused token or an unreachable server is one line. */
export async function connect(
	server: string | undefined,
	options: { env?: NodeJS.ProcessEnv; fetcher?: typeof fetch } = {}
): Promise<Remote> {
	const settings = remoteSettings(server, options.env);
	const send = authorisedFetch(settings.server, settings.token, options.fetcher ?? fetch);
	let workspaces: WorkspaceSummary[];
	try {
		({ workspaces } = await callApi('workspaces.list', {}, send));
	} catch (error) {
		throw remoteError(error, settings.server);
	}
	if (workspaces.length !== 1)
		throw new InputError(
			`${settings.server.origin} did not name one workspace for this token; is FRAMEWRIGHT_TOKEN an access token?`
		);
	const [workspace] = workspaces;
	return {
		server: settings.server,
		workspace,
		api: workspaceApi(workspace.slug, send),
		request: (name, input, init) => {
			const url = endpointUrl(name, {
				params: { ...input.params, ws: workspace.slug } as ParamsOf<typeof name>,
				query: input.query
			});
			return send(url, init).catch((error: unknown) => {
				throw remoteError(error, settings.server);
			});
		}
	};
}

/** A refusal or failure of the server as the one-line InputError every command exits 1 with. */
export function remoteError(error: unknown, server?: URL): InputError {
	if (error instanceof InputError || error instanceof UsageError) return error;
	if (error instanceof ApiError) {
		if (error.status === 0)
			return new InputError(`cannot reach ${server?.origin ?? 'the server'}: is it running?`);
		const issues = error.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
		return new InputError(`${error.message}${issues ? ` (${issues})` : ''} [HTTP ${error.status}]`);
	}
	const cause = (error as { cause?: { code?: string } }).cause?.code;
	if (error instanceof TypeError && cause)
		return new InputError(`cannot reach ${server?.origin ?? 'the server'}: ${cause}`);
	return new InputError(error instanceof Error ? error.message : String(error));
}

/** The failure of a raw request (a download, the upload) with the server's own words. */
export async function responseError(response: Response): Promise<InputError> {
	let message = `the server answered ${response.status}`;
	let issues: { path: string; message: string }[] = [];
	try {
		const body = (await response.json()) as {
			error?: unknown;
			issues?: unknown;
			message?: unknown;
		};
		if (typeof body.error === 'string') message = body.error;
		else if (typeof body.message === 'string') message = body.message;
		if (Array.isArray(body.issues)) issues = body.issues as typeof issues;
	} catch {
		// Not JSON (a proxy's page): the status says enough.
	}
	return remoteError(new ApiError(response.status, message, issues));
}
