import type { DB } from './db/connection';

const HOUR_MS = 60 * 60 * 1000;

/**
 * Per-address limit on sign-in links: returns true (and records the request) while fewer than
 * `limitPerHour` links went to this address in the past hour. Refused requests are not recorded,
 * so the window always reopens an hour after the earliest counted link.
 */
export async function claimSigninLink(
	db: DB,
	email: string,
	limitPerHour: number,
	now = Date.now()
): Promise<boolean> {
	const address = email.trim().toLowerCase();
	return db.transaction().execute(async (trx) => {
		await trx
			.deleteFrom('signin_requests')
			.where('requested_at', '<', now - 24 * HOUR_MS)
			.execute();
		const { n } = await trx
			.selectFrom('signin_requests')
			.select((eb) => eb.fn.countAll<number>().as('n'))
			.where('email', '=', address)
			.where('requested_at', '>', now - HOUR_MS)
			.executeTakeFirstOrThrow();
		if (Number(n) >= limitPerHour) return false;
		await trx.insertInto('signin_requests').values({ email: address, requested_at: now }).execute();
		return true;
	});
}
