import { building } from '$app/environment';
import type { Handle, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { authHandle } from '$lib/server/auth';
import { limitRequestBodies } from '$lib/server/http/body-limits';
import { pinCookieSecurity } from '$lib/server/http/cookies';
import { addSecurityHeaders } from '$lib/server/http/headers';
import { getServices } from '$lib/server/startup';
import { withRequestContext } from '$lib/server/request-context';
import { bearerOf } from '$lib/server/tokens/bearer';

// Opens and migrates the database and starts the demo mail server before the first request, so a
// misconfiguration fails at start-up rather than on someone's click. (Demo data is seeded before the
// server starts, by db/demo-start.ts.)
export const init: ServerInit = async () => {
	if (!building) await getServices();
};

const provideServices: Handle = async ({ event, resolve }) => {
	event.locals.services = await getServices();
	event.locals.user = null;
	event.locals.bearer = null;
	return resolve(event);
};

// An access token is read here and judged by the guard (src/lib/server/guard.ts): it never becomes
// `locals.user`, so a page that forgot the guard still cannot be used with one. The request runs in
// its own context, so audit rows of changes made with a token name it.
const resolveBearer: Handle = async ({ event, resolve }) => {
	const { db } = event.locals.services;
	event.locals.bearer = await bearerOf(db, event.request.headers.get('authorization'));
	return withRequestContext(() => resolve(event));
};

const resolveUser: Handle = async ({ event, resolve }) => {
	// The health check answers for the database itself; it must not fail on the session lookup first.
	if (event.route.id === '/healthz') return resolve(event);
	const session = await event.locals.auth();
	const user = session?.user;
	if (user?.id && user.email) {
		event.locals.user = { id: user.id, email: user.email, name: user.name ?? null };
	}
	return resolve(event);
};

export const handle: Handle = sequence(
	provideServices,
	addSecurityHeaders,
	limitRequestBodies,
	pinCookieSecurity,
	resolveBearer,
	authHandle,
	resolveUser
);
