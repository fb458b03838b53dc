/**
 * An HTTP server for tests that runs the app's own `+server.ts` handlers (the JSON API and the
 * downloads) over a real socket, with the request pipeline's access-token step: command-line tests
 * talk to it exactly as to a deployed server, without building the app. Pages are not served.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { Readable } from 'node:stream';
import { isHttpError, isRedirect, type RequestEvent } from '@sveltejs/kit';
import { withRequestContext } from './request-context';
import type { Services } from './services';
import { makeEvent } from './test-support';
import { bearerOf } from './tokens/bearer';

type Handler = (event: RequestEvent) => Promise<Response>;

const modules = import.meta.glob<Record<string, unknown>>('../../routes/**/+server.ts');

/** Route files as patterns, static ones first (so `template.csv` wins over `[mapId]`). */
const routes = Object.keys(modules)
	.map((file) => {
		const id = file.replace('../../routes', '').replace(/\/\+server\.ts$/, '') || '/';
		const names: string[] = [];
		const source = id
			.split('/')
			.map((part) => {
				const param = /^\[(\w+)\]$/.exec(part);
				if (!param) return part.replace(/[.*+?^${}()|\\]/g, '\\$&');
				names.push(param[1]);
				return '([^/]+)';
			})
			.join('/');
		return { file, id, names, pattern: new RegExp(`^${source}$`) };
	})
	.sort((a, b) => a.names.length - b.names.length);

async function answer(services: Services, req: IncomingMessage): Promise<Response> {
	const url = new URL(req.url ?? '/', 'http://localhost');
	const route = routes.find((r) => r.pattern.test(url.pathname));
	if (!route) return new Response('Not found', { status: 404 });
	const values = route.pattern.exec(url.pathname)!.slice(1).map(decodeURIComponent);
	const params = Object.fromEntries(route.names.map((n, i) => [n, values[i]]));
	const method = req.method ?? 'GET';
	const handler = (await modules[route.file]())[method] as Handler | undefined;
	if (!handler) return new Response('Method not allowed', { status: 405 });
	const headers = new Headers();
	for (const [name, value] of Object.entries(req.headers))
		if (typeof value === 'string') headers.set(name, value);
	const request = new Request(url, {
		method,
		headers,
		body:
			method === 'GET' || method === 'HEAD' ? undefined : (Readable.toWeb(req) as ReadableStream),
		duplex: 'half'
	} as RequestInit);
	const event = makeEvent<RequestEvent>({
		services,
		user: null,
		routeId: route.id,
		params,
		method,
		path: url.pathname + url.search,
		request,
		bearer: await bearerOf(services.db, headers.get('authorization'))
	});
	try {
		return await withRequestContext(() => handler(event));
	} catch (thrown) {
		// What SvelteKit answers a script (Accept: application/json) for error() and redirect().
		if (isHttpError(thrown)) return Response.json(thrown.body, { status: thrown.status });
		if (isRedirect(thrown))
			return new Response(null, { status: thrown.status, headers: { location: thrown.location } });
		throw thrown;
	}
}

async function reply(res: ServerResponse, response: Response): Promise<void> {
	res.writeHead(response.status, Object.fromEntries(response.headers));
	if (response.body)
		for await (const chunk of Readable.fromWeb(response.body as never)) res.write(chunk);
	res.end();
}

export async function startTestServer(
	services: Services
): Promise<{ url: string; close: () => Promise<void> }> {
	const server = createServer((req, res) => {
		answer(services, req)
			.then((response) => reply(res, response))
			.catch((error: unknown) => {
				console.error(error);
				if (!res.headersSent) res.writeHead(500);
				res.end();
			});
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	const { port } = server.address() as AddressInfo;
	return {
		url: `http://127.0.0.1:${port}`,
		close: () => new Promise((resolve) => server.close(() => resolve()))
	};
}
