// Issue 10, finding 9: `POST /signout` without a form content type answered 500 (@auth/sveltekit's
// signOut reads a form body). Any body, or none, must end the session and redirect.
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import {
	countRows,
	createTestServices,
	createUser,
	makeEvent,
	outcome
} from '$lib/server/test-support';
import * as signout from './+server';

async function signedIn() {
	const services = await createTestServices();
	const user = await createUser(services.db, 'crew@example.test');
	const sessionToken = crypto.randomUUID();
	await services.db
		.insertInto('Session')
		.values({
			sessionToken,
			userId: user.id,
			expires: new Date(Date.now() + 86_400_000).toISOString()
		})
		.execute();
	return { services, user, sessionToken };
}

function post(
	world: Awaited<ReturnType<typeof signedIn>>,
	init: { body?: BodyInit; contentType?: string }
) {
	const event = makeEvent<RequestEvent>({
		services: world.services,
		user: world.user,
		routeId: '/signout',
		method: 'POST'
	});
	const headers = new Headers({ cookie: `authjs.session-token=${world.sessionToken}` });
	if (init.contentType) headers.set('content-type', init.contentType);
	const request = new Request('http://localhost/signout', {
		method: 'POST',
		headers,
		body: init.body
	});
	const cleared: string[] = [];
	return {
		event: {
			...event,
			request,
			cookies: { ...event.cookies, set: (name: string) => void cleared.push(name) }
		} as unknown as Parameters<typeof signout.POST>[0],
		cleared
	};
}

describe('POST /signout', () => {
	it.each([
		['no body and no content type', {}],
		['a JSON body', { body: '{"x":1}', contentType: 'application/json' }],
		['a malformed multipart body', { body: 'garbage', contentType: 'multipart/form-data' }]
	])('with %s: ends the session and redirects home (not a 500)', async (_name, init) => {
		const world = await signedIn();
		const { event, cleared } = post(world, init);
		expect(await outcome(() => signout.POST(event))).toEqual({
			kind: 'redirect',
			status: 303,
			location: '/'
		});
		expect(await countRows(world.services.db, 'Session')).toBe(0);
		expect(cleared).toContain('authjs.session-token');
	});

	it('follows a local redirectTo, and refuses an off-site one', async () => {
		const world = await signedIn();
		const local = post(world, {
			body: new URLSearchParams({ redirectTo: '/signin?callbackUrl=%2Finvite%2Fabc' }),
			contentType: 'application/x-www-form-urlencoded'
		});
		expect(await outcome(() => signout.POST(local.event))).toEqual({
			kind: 'redirect',
			status: 303,
			location: '/signin?callbackUrl=%2Finvite%2Fabc'
		});
		const away = post(world, {
			body: new URLSearchParams({ redirectTo: '/\t/evil.example' }),
			contentType: 'application/x-www-form-urlencoded'
		});
		expect(await outcome(() => signout.POST(away.event))).toMatchObject({ location: '/' });
	});
});
