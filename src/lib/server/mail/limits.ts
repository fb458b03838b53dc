/**
 * How much mail one account or one client address can make the server send: invitations per
 * account and per client address, sign-in requests per client address (the per-address limit on
 * sign-in links is `signin-requests.ts`, kept in the database). Counted in memory with
 * rate-limiter-flexible: a restart forgets the counts, which an abuser cannot cause.
 */
import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible';
import type { AppConfig } from '../config';
import { Problem } from '../problem';

const HOUR_SECONDS = 60 * 60;

export interface MailLimits {
	signInByClient: RateLimiterMemory;
	invitationsByAccount: RateLimiterMemory;
	invitationsByClient: RateLimiterMemory;
}

export function createMailLimits(
	config: Pick<
		AppConfig,
		| 'signinRequestsPerClientPerHour'
		| 'invitationsPerAccountPerHour'
		| 'invitationsPerClientPerHour'
	>
): MailLimits {
	const perHour = (points: number) => new RateLimiterMemory({ points, duration: HOUR_SECONDS });
	return {
		signInByClient: perHour(config.signinRequestsPerClientPerHour),
		invitationsByAccount: perHour(config.invitationsPerAccountPerHour),
		invitationsByClient: perHour(config.invitationsPerClientPerHour)
	};
}

/** Counts one against each key; null while every limit allows it, else the minutes until it does. */
export async function takeMailAllowance(
	checks: [RateLimiterMemory, string][]
): Promise<number | null> {
	let wait = 0;
	for (const [limiter, key] of checks) {
		try {
			await limiter.consume(key);
		} catch (refused) {
			if (!(refused instanceof RateLimiterRes)) throw refused;
			wait = Math.max(wait, refused.msBeforeNext);
		}
	}
	return wait > 0 ? Math.max(1, Math.ceil(wait / 60_000)) : null;
}

/** The 429 of a mail limit, saying when to try again. */
export function tooManyMails(what: string, minutes: number): Problem {
	return new Problem(
		429,
		`Too many ${what} in the last hour; try again in about ${minutes} minute${minutes === 1 ? '' : 's'}.`
	);
}
