import type { PageServerLoad } from './$types';

// Auth.js error codes (see @auth/core errors: ErrorType) mapped to wording a person can act on.
const messages: Record<string, string> = {
	Verification:
		'This sign-in link has expired or was already used. Each link works once and for a limited time — ask for a new one.',
	AccessDenied: 'Signing in was refused for this address.',
	Configuration:
		'Signing in is not working right now because of a server problem. Try again later, or tell the site administrator.'
};

export const load = (async ({ url }) => {
	const code = url.searchParams.get('error') ?? 'Default';
	return {
		code,
		message: messages[code] ?? 'Signing in did not work. Ask for a new sign-in link and try again.'
	};
}) satisfies PageServerLoad;
