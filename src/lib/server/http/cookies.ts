/**
 * Every cookie the server sets is `Secure` exactly when ORIGIN is https (`config.secureCookies`).
 *
 * SvelteKit's `cookies.set` makes a cookie Secure unless told otherwise (except on
 * http://localhost), and @auth/sveltekit re-sets the session cookie on every request from Auth.js's
 * Set-Cookie header, where "not Secure" is simply absent — so on a plain-http address other than
 * localhost each session refresh came back Secure, and browsers drop a Secure cookie over http
 * (the session was lost). Auth.js's own choice is pinned in auth-config.ts (`useSecureCookies`).
 */
import type { Handle } from '@sveltejs/kit';

export const pinCookieSecurity: Handle = async ({ event, resolve }) => {
	const secure = event.locals.services.config.secureCookies;
	const { cookies } = event;
	const set = cookies.set.bind(cookies);
	const remove = cookies.delete.bind(cookies);
	cookies.set = (name, value, options) => set(name, value, { ...options, secure });
	cookies.delete = (name, options) => remove(name, { ...options, secure });
	return resolve(event);
};
