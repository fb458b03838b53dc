import { signOut } from '$lib/server/auth';
import type { RequestHandler } from './$types';

// A POST form (`<form method="post" action="/signout">`, optional `redirectTo` field) ends the
// session: Auth.js deletes the database session and clears the cookie, then redirects.
export const POST: RequestHandler = async (event) => {
	await signOut(event);
	return new Response(null, { status: 303, headers: { location: '/' } });
};
