// `GET /healthz` (issue 10, operations): 200 while the database takes writes and the storage takes
// files; 503 naming the part that does not, and the reason.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as healthz from '../../routes/healthz/+server';
import { createLocalStorage } from './storage';
import { countRows, createTestServices, makeEvent, type TestServices } from './test-support';

async function ask(services: TestServices) {
	const response = await healthz.GET(
		makeEvent<RequestEvent>({ services, user: null, routeId: '/healthz' }) as never
	);
	return { status: response.status, body: await response.json() };
}

describe('GET /healthz', () => {
	it('answers 200 with both parts ok, leaving nothing behind', async () => {
		const services = await createTestServices();
		expect(await ask(services)).toEqual({
			status: 200,
			body: { status: 'ok', database: { ok: true }, storage: { ok: true } }
		});
		expect(await countRows(services.db, 'signin_requests')).toBe(0);
		expect(await services.storage.exists('health')).toBe(false);
	});

	it('answers 503 when the storage cannot be written', async () => {
		const services = await createTestServices();
		// A store whose folder lies under a plain file: no one, not even root, can create it.
		const blocker = join(services.storageRoot, 'not-a-folder');
		writeFileSync(blocker, 'x');
		const broken = { ...services, storage: createLocalStorage({ root: join(blocker, 'store') }) };
		const { status, body } = await ask(broken);
		expect(status).toBe(503);
		expect(body).toMatchObject({
			status: 'failing',
			database: { ok: true },
			storage: { ok: false, error: expect.stringMatching(/ENOTDIR|not a directory/) }
		});
	});

	it('answers 503 when the database is closed', async () => {
		const services = await createTestServices();
		await services.db.destroy();
		const { status, body } = await ask(services);
		expect(status).toBe(503);
		expect(body).toMatchObject({
			status: 'failing',
			database: { ok: false, error: expect.any(String) },
			storage: { ok: true }
		});
	});
});
