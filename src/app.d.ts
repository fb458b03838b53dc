// See https://svelte.dev/docs/kit/types#app.d.ts
import type { SessionUser } from '$lib/server/guard';
import type { Services } from '$lib/server/services';

declare global {
	namespace App {
		// interface Error {}
		interface Locals {
			/** Process-wide database, settings and mailer (set first thing in hooks.server.ts). */
			services: Services;
			/** The signed-in person, or null. */
			user: SessionUser | null;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
