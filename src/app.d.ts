// See https://svelte.dev/docs/kit/types#app.d.ts
import type { SessionUser } from '$lib/server/guard';
import type { Services } from '$lib/server/services';
import type { BearerCredential } from '$lib/server/tokens/bearer';

declare global {
	namespace App {
		// interface Error {}
		interface Locals {
			/** Process-wide database, settings and mailer (set first thing in hooks.server.ts). */
			services: Services;
			/** The signed-in person, or null (never set from an access token). */
			user: SessionUser | null;
			/** The `Authorization: Bearer` credential, or null; only the guard decides what it may do. */
			bearer: BearerCredential | null;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
