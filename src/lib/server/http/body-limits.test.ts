// Issue 10, findings 1, 3 and 8, against a real HTTP server: Node's http server with SvelteKit's own
// adapter glue (`getRequest`/`setResponse` from @sveltejs/kit/node, as adapter-node uses them, with
// BODY_SIZE_LIMIT=Infinity as `npm start` sets it), the body-limit hook, and the real route
// handlers; a real HTTP client (node:http) sends the bodies.
//  1. an anonymous 100 MB sign-in form was held in memory and echoed back whole;
//  3. `PUT …/draft` had no size cap (a 37 MB draft froze the server);
//  8. binary or UTF-16 uploads above ~64 KB and over-limit uploads without Content-Length got a
//     connection reset instead of the 415/413 message.
import { MAX_ECHOED_CHARS } from '../forms';
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fail, json, type RequestEvent } from '@sveltejs/kit';
import { getRequest, setResponse } from '@sveltejs/kit/node';
import { afterEach, describe, expect, it } from 'vitest';
import * as capturesRoute from '../../../routes/api/workspaces/[ws]/captures/+server';
import * as draftRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/draft/+server';
import * as signinPage from '../../../routes/signin/+page.server';
import type { SessionUser } from '../guard';
import { createMap } from '../maps/maps';
import {
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	makeEvent,
	type TestServices
} from '../test-support';
import { BODY_LIMITS, limitRequestBodies } from './body-limits';

type Handler = (event: RequestEvent) => Promise<Response>;

interface Mounted {
	routeId: string;
	params?: Record<string, string>;
	handler: Handler;
}

const servers: Server[] = [];
afterEach(async () => {
	await Promise.all(servers.splice(0).map((s) => new Promise((done) => s.close(done))));
});

/** One route behind the hook, as adapter-node serves it; a thrown error becomes a 500, as in SvelteKit. */
async function serve(services: TestServices, user: SessionUser | null, route: Mounted) {
	const server = createServer(async (req, res) => {
		const request = await getRequest({
			request: req,
			base: 'http://localhost',
			bodySizeLimit: Infinity
		});
		const event = makeEvent<RequestEvent>({
			services,
			user,
			routeId: route.routeId,
			params: route.params
		});
		Object.assign(event, { request, url: new URL(request.url) });
		const response = await limitRequestBodies({
			event,
			resolve: async (e) => {
				try {
					return await route.handler(e);
				} catch (thrown) {
					const status = (thrown as { status?: number }).status ?? 500;
					return new Response('handler failed', { status });
				}
			}
		});
		await setResponse(res, response);
	});
	servers.push(server);
	await new Promise<void>((ready) => server.listen(0, '127.0.0.1', ready));
	return (server.address() as AddressInfo).port;
}

interface Sent {
	method: string;
	path: string;
	headers?: Record<string, string>;
	/** Sent in 64 KiB pieces; without `contentLength: true` it goes chunked (no Content-Length). */
	body: Uint8Array;
	contentLength?: boolean;
}

/** Sends a request as a browser would (the whole body, then reads the answer); a reset rejects. */
function send(port: number, sent: Sent): Promise<{ status: number; text: string }> {
	return new Promise((resolve, reject) => {
		const headers: Record<string, string> = { ...sent.headers };
		if (sent.contentLength !== false) headers['content-length'] = String(sent.body.byteLength);
		const req = httpRequest({
			host: '127.0.0.1',
			port,
			method: sent.method,
			path: sent.path,
			headers
		});
		req.on('response', (res) => {
			const parts: Buffer[] = [];
			res.on('data', (b: Buffer) => parts.push(b));
			res.on('end', () =>
				resolve({ status: res.statusCode ?? 0, text: Buffer.concat(parts).toString('utf8') })
			);
			res.on('error', reject);
		});
		req.on('error', reject);
		let at = 0;
		const write = () => {
			while (at < sent.body.byteLength) {
				const piece = sent.body.subarray(at, at + 64 * 1024);
				at += piece.byteLength;
				if (!req.write(piece)) return void req.once('drain', write);
			}
			req.end();
		};
		write();
	});
}

const MB = 1000 * 1000;
const text = (s: string) => new TextEncoder().encode(s);

describe('request body limits (finding 1: the sign-in form)', () => {
	const signinRoute: Mounted = {
		routeId: '/signin',
		// What SvelteKit makes of the action's answer, enough to see an echo.
		handler: async (event) => {
			const result = (await signinPage.actions.default(event as never)) as ReturnType<typeof fail>;
			return json(result.data, { status: result.status });
		}
	};
	const form = { 'content-type': 'application/x-www-form-urlencoded' };

	it('a 100 MB form with Content-Length: 413 with a short message, nothing echoed, no mail', async () => {
		const services = await createTestServices();
		const port = await serve(services, null, signinRoute);
		const body = new Uint8Array(100 * MB).fill(0x61); // "aaaa…"
		body.set(text('email='));
		const answer = await send(port, { method: 'POST', path: '/signin', headers: form, body });
		expect(answer.status).toBe(413);
		expect(answer.text).toMatch(/larger than 8 KiB/);
		expect(answer.text.length).toBeLessThan(500);
		expect(services.outbox).toEqual([]);
	});

	it('the same without Content-Length (chunked): cut off at the limit, 413, nothing echoed', async () => {
		const services = await createTestServices();
		const port = await serve(services, null, signinRoute);
		const body = new Uint8Array(2 * MB).fill(0x61);
		body.set(text('email='));
		const answer = await send(port, {
			method: 'POST',
			path: '/signin',
			headers: form,
			body,
			contentLength: false
		});
		expect(answer.status).toBe(413);
		expect(answer.text.length).toBeLessThan(500);
	});

	it('a normal sign-in form still gets through (and a bad address is answered 400, clipped)', async () => {
		const services = await createTestServices();
		const port = await serve(services, null, signinRoute);
		const long = `${'x'.repeat(3000)}@example.test`;
		const answer = await send(port, {
			method: 'POST',
			path: '/signin',
			headers: form,
			body: text(new URLSearchParams({ email: long }).toString())
		});
		expect(answer.status).toBe(400);
		const data = JSON.parse(answer.text) as { values: { email: string } };
		// Form actions send back what was typed cut to MAX_ECHOED_CHARS (src/lib/server/forms.ts), never whole.
		expect(data.values.email.length).toBeLessThanOrEqual(MAX_ECHOED_CHARS);
		expect(data.values.email.length).toBeLessThan(long.length);
	});
});

describe('request body limits (finding 3: the draft save)', () => {
	async function draftWorld() {
		const services = await createTestServices();
		const team = await createTeam(services.db, 'Draft limit team');
		const { id: mapId } = await createMap(services.db, {
			workspaceId: team.workspace.id,
			map: fixtureMap('club-racer-ecu.map.json'),
			actorId: team.users.editor.id,
			source: 'json'
		});
		const port = await serve(services, team.users.editor, {
			routeId: '/api/workspaces/[ws]/maps/[mapId]/draft',
			params: { ws: team.workspace.slug, mapId },
			handler: draftRoute.PUT as unknown as Handler
		});
		return { services, port, path: `/api/workspaces/${team.workspace.slug}/maps/${mapId}/draft` };
	}
	/** A draft of `frames` frames without signals, as JSON bytes. */
	const bigDraft = (frames: number) =>
		text(
			JSON.stringify({
				version: 1,
				draft: {
					format: 'framewright-map@1',
					name: 'Huge',
					frames: Array.from({ length: frames }, (_, i) => ({
						name: `F${i}`,
						id: i,
						extended: true,
						length: 8,
						signals: []
					}))
				}
			})
		);
	const jsonType = { 'content-type': 'application/json' };

	it('a 300,000-frame draft (over 5 MiB) is refused with 413 and leaves the draft as it was', async () => {
		const w = await draftWorld();
		const body = bigDraft(300_000);
		expect(body.byteLength).toBeGreaterThan(BODY_LIMITS.draft);
		for (const contentLength of [true, false]) {
			const answer = await send(w.port, {
				method: 'PUT',
				path: w.path,
				headers: jsonType,
				body,
				contentLength
			});
			expect(answer.status).toBe(413);
			const problem = JSON.parse(answer.text) as { error: string; maxBytes: number };
			expect(problem).toEqual({
				error: expect.stringMatching(/larger than 5 MiB/),
				maxBytes: 5 * 1024 * 1024
			});
		}
		const map = await w.services.db
			.selectFrom('maps')
			.select('draft_version')
			.executeTakeFirstOrThrow();
		expect(map.draft_version).toBe(1);
	});

	it('a draft within the limit is saved', async () => {
		const w = await draftWorld();
		const answer = await send(w.port, {
			method: 'PUT',
			path: w.path,
			headers: jsonType,
			body: bigDraft(1000)
		});
		expect(answer.status).toBe(200);
	});
});

describe('uploads refused cleanly (finding 8)', () => {
	async function uploadWorld(env: Record<string, string> = {}) {
		const services = await createTestServices(env);
		const team = await createTeam(services.db, 'Upload team');
		const port = await serve(services, team.users.viewer, {
			routeId: '/api/workspaces/[ws]/captures',
			params: { ws: team.workspace.slug },
			handler: capturesRoute.POST as unknown as Handler
		});
		const path = `/api/workspaces/${team.workspace.slug}/captures?name=x.csv`;
		// As the upload page sends a file (src/routes/w/[ws]/captures/upload.ts).
		const upload = (body: Uint8Array, contentLength = true) =>
			send(port, {
				method: 'POST',
				path,
				headers: { 'content-type': 'application/octet-stream' },
				body,
				contentLength
			});
		return { services, upload };
	}

	it('a 2 MB binary file: the whole body is taken, then 415 with the message', async () => {
		const w = await uploadWorld();
		const body = new Uint8Array(2 * MB);
		for (let i = 0; i < body.length; i++) body[i] = (i * 7919) % 251; // bytes of every kind, NULs too
		const answer = await w.upload(body);
		expect(answer.status).toBe(415);
		expect(JSON.parse(answer.text).error).toMatch(/not a capture Framewright can read/);
		expect(await w.services.db.selectFrom('captures').select('id').execute()).toEqual([]);
	});

	it('a UTF-16 capture above 64 KiB: 415 with the message', async () => {
		const w = await uploadWorld();
		const csv = fixtureText('club-racer-session.csv').slice(0, 200_000);
		const utf16 = new Uint8Array(Buffer.from(`\ufeff${csv}`, 'utf16le'));
		expect(utf16.byteLength).toBeGreaterThan(64 * 1024);
		const answer = await w.upload(utf16);
		expect(answer.status).toBe(415);
		expect(JSON.parse(answer.text).error).toMatch(/binary data/);
	});

	it('an over-limit upload without Content-Length: 413 with the limit, nothing stored', async () => {
		const w = await uploadWorld({ CAPTURE_MAX_BYTES: String(256 * 1024) });
		const csv = fixtureText('club-racer-session.csv');
		const body = text(csv.repeat(Math.ceil((1 * MB) / csv.length)));
		const answer = await w.upload(body, false);
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.text)).toMatchObject({ maxBytes: 256 * 1024 });
		expect(await w.services.db.selectFrom('captures').select('id').execute()).toEqual([]);
	});

	it('a good capture still uploads (201)', async () => {
		const w = await uploadWorld();
		const body = text(fixtureText('club-racer-session.csv'));
		const answer = await w.upload(body);
		expect(answer.status).toBe(201);
	});
});
