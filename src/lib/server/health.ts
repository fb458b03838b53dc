/**
 * `GET /healthz` for load balancers, service managers and monitoring: can this process read and
 * write its database, and write to its capture storage? Answers 200 when both work, else 503,
 * always with JSON saying which part failed and why.
 */
import type { Services } from './services';

export interface PartHealth {
	ok: boolean;
	error?: string;
}

export interface Health {
	status: 'ok' | 'failing';
	database: PartHealth;
	storage: PartHealth;
}

async function check(work: () => Promise<unknown>): Promise<PartHealth> {
	try {
		await work();
		return { ok: true };
	} catch (error) {
		return { ok: false, error: error instanceof Error ? error.message : String(error) };
	}
}

async function* probeBytes(): AsyncGenerator<Uint8Array> {
	yield new TextEncoder().encode('ok');
}

export async function checkHealth(services: Pick<Services, 'db' | 'storage'>): Promise<Health> {
	const database = await check(async () => {
		// A write inside a transaction that is rolled back: proves the file is writable, changes nothing.
		await services.db
			.transaction()
			.execute(async (trx) => {
				await trx
					.insertInto('signin_requests')
					.values({ email: 'health-probe', requested_at: 0 })
					.execute();
				throw new RolledBack();
			})
			.catch((error: unknown) => {
				if (!(error instanceof RolledBack)) throw error;
			});
	});
	const storage = await check(async () => {
		const key = `health/probe-${crypto.randomUUID()}`;
		await services.storage.put(key, probeBytes());
		await services.storage.delete(key);
	});
	return { status: database.ok && storage.ok ? 'ok' : 'failing', database, storage };
}

class RolledBack extends Error {}
