import { redirect } from '@sveltejs/kit';
import { endSession, safeCallbackUrl } from '$lib/server/auth';
import type { RequestHandler } from './$types';

/** The form's `redirectTo` field, if the body is a form at all (a bare POST has none). */
async function redirectTarget(request: Request): Promise<unknown> {
	const type = request.headers.get('content-type') ?? '';
	if (!/^(application\/x-www-form-urlencoded|multipart\/form-data)/i.test(type)) return null;
	try {
		return (await request.formData()).get('redirectTo');
	} catch {
		return null; // a malformed form still signs out
	}
}

// A POST form (`<form method="post" action="/signout">`, optional `redirectTo` field with a local
// path) ends the session: Auth.js deletes the database session and clears the cookie; then a
// redirect, to that path or home. Any body, or none, gets the same redirect.
export const POST: RequestHandler = async (event) => {
	const target = safeCallbackUrl(await redirectTarget(event.request));
	await endSession(event);
	redirect(303, target);
};
