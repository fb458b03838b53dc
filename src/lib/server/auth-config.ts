import { KyselyAdapter, type Database as AuthDatabase } from '@auth/kysely-adapter';
import type { SvelteKitAuthConfig } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import type { Kysely } from 'kysely';
import type { AppConfig } from './config';
import type { DB } from './db';
import { claimSigninLink } from './signin-requests';
import { signInMail } from './mail/templates';
import type { SendMail } from './mail/send';

export interface AuthDeps {
	db: DB;
	config: AppConfig;
	sendMail: SendMail;
	/** Falls back to AUTH_SECRET from the environment (read by @auth/sveltekit). */
	secret?: string;
}

export const authPages = {
	signIn: '/signin',
	verifyRequest: '/signin/check',
	error: '/signin/error'
} as const;

/**
 * Auth.js settings: sign-in by e-mail link only, sessions kept in the database. Built from explicit
 * dependencies so tests can drive Auth.js directly against an in-memory database.
 */
export function createAuthConfig({ db, config, sendMail, secret }: AuthDeps): SvelteKitAuthConfig {
	return {
		// Our Database interface stores dates as ISO text, which the adapter converts itself on SQLite.
		adapter: KyselyAdapter(db as unknown as Kysely<AuthDatabase>),
		providers: [
			Nodemailer({
				// Required by the provider's factory; our sendVerificationRequest uses sendMail instead.
				server: {
					host: config.smtp?.host ?? '127.0.0.1',
					port: config.smtp?.port ?? config.standInSmtpPort
				},
				from: config.mailFrom,
				maxAge: config.signinLinkMaxAgeSeconds,
				async sendVerificationRequest({ identifier, url, expires }) {
					// Over the limit we send nothing but answer exactly as usual, so the page never reveals
					// whether an address exists or was throttled.
					if (!(await claimSigninLink(db, identifier, config.signinLinksPerHour))) return;
					await sendMail(signInMail(identifier, url, expires));
				}
			})
		],
		session: { strategy: 'database', maxAge: config.sessionMaxAgeSeconds },
		// Pinned to ORIGIN's scheme rather than guessed per request (X-Forwarded-Proto, the request URL):
		// a plain-http site must never get a Secure cookie, which browsers drop over http.
		useSecureCookies: config.secureCookies,
		pages: authPages,
		basePath: '/auth',
		trustHost: true,
		secret,
		callbacks: {
			session({ session, user }) {
				return { ...session, user: { ...session.user, id: user.id } };
			}
		}
	};
}
