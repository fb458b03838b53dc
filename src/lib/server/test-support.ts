// Helpers for server tests: a real, freshly migrated in-memory SQLite database and hand-built
// SvelteKit request events, so route handlers run exactly as in the server (no mocks of Kysely).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import { loadConfig, type AppConfig } from './config';
import { createDatabase, migrateToLatest, type DB } from './db';
import type { SessionUser } from './guard';
import type { OutgoingMail } from './mail/send';
import type { Services } from './services';
import { createLocalStorage } from './storage';

export async function createTestDatabase(): Promise<DB> {
	const db = createDatabase(':memory:');
	await migrateToLatest(db);
	return db;
}

export interface TestServices extends Services {
	/** Every message the app asked to send, in order. */
	outbox: OutgoingMail[];
	/** The temporary folder of `storage`. */
	storageRoot: string;
}

export async function createTestServices(env: Record<string, string> = {}): Promise<TestServices> {
	const db = await createTestDatabase();
	const config: AppConfig = loadConfig({ FRAMEWRIGHT_DEMO: '1', ...env });
	const outbox: OutgoingMail[] = [];
	// Each test's own store in a fresh temporary folder (the OS cleans the temp folder).
	const storageRoot = mkdtempSync(join(tmpdir(), 'fw-test-storage-'));
	return {
		db,
		config,
		outbox,
		storage: createLocalStorage({ root: storageRoot, maxBytes: 4 * config.captureMaxBytes }),
		storageRoot,
		secret: 'test-secret-0123456789abcdef0123456789abcdef',
		sendMail: async (message) => {
			outbox.push(message);
		}
	};
}

export async function createUser(
	db: DB,
	email: string,
	name: string | null = null
): Promise<SessionUser> {
	const user = { id: crypto.randomUUID(), email, name };
	await db
		.insertInto('User')
		.values({ ...user, emailVerified: null, image: null })
		.execute();
	return user;
}

export async function countRows(
	db: DB,
	table:
		| 'User'
		| 'workspaces'
		| 'memberships'
		| 'invitations'
		| 'audit_log'
		| 'VerificationToken'
		| 'signin_requests'
		| 'Session'
		| 'maps'
		| 'map_revisions'
		| 'share_links'
): Promise<number> {
	const { n } = await db
		.selectFrom(table)
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.executeTakeFirstOrThrow();
	return Number(n);
}

export interface EventInit {
	services: Services;
	user: SessionUser | null;
	routeId: string;
	params?: Record<string, string>;
	method?: string;
	/** JSON-encoded unless it is FormData or a string. */
	body?: unknown;
	path?: string;
}

/** A RequestEvent good enough for our loads, actions and +server.ts handlers. */
export function makeEvent<E = RequestEvent>(init: EventInit): E {
	const params = init.params ?? {};
	const path =
		init.path ?? init.routeId.replace(/\[(\w+)\]/g, (_, name: string) => params[name] ?? name);
	const url = new URL(`http://localhost${path}`);
	let body: BodyInit | undefined;
	const headers = new Headers();
	if (init.body instanceof FormData || typeof init.body === 'string') body = init.body;
	else if (init.body !== undefined) {
		body = JSON.stringify(init.body);
		headers.set('content-type', 'application/json');
	}
	const request = new Request(url, {
		method: init.method ?? (body ? 'POST' : 'GET'),
		body,
		headers
	});
	const cookies = new Map<string, string>();
	return {
		locals: { services: init.services, user: init.user },
		params,
		url,
		route: { id: init.routeId },
		request,
		cookies: {
			get: (name: string) => cookies.get(name),
			getAll: () => [...cookies].map(([name, value]) => ({ name, value })),
			set: (name: string, value: string) => void cookies.set(name, value),
			delete: (name: string) => void cookies.delete(name),
			serialize: () => ''
		},
		setHeaders: () => {},
		getClientAddress: () => '127.0.0.1',
		fetch,
		isDataRequest: false,
		isSubRequest: false,
		platform: undefined,
		depends: () => {},
		parent: async () => ({}),
		untrack: <T>(fn: () => T) => fn()
	} as unknown as E;
}

/** Runs a load or action and reports a thrown redirect or error as a value. */
export async function outcome(
	run: () => unknown
): Promise<
	| { kind: 'value'; value: unknown }
	| { kind: 'redirect'; status: number; location: string }
	| { kind: 'error'; status: number; message: string }
> {
	try {
		return { kind: 'value', value: await run() };
	} catch (thrown) {
		const t = thrown as { status?: number; location?: string; body?: { message?: string } };
		if (typeof t.location === 'string' && typeof t.status === 'number') {
			return { kind: 'redirect', status: t.status, location: t.location };
		}
		if (typeof t.status === 'number' && t.body)
			return { kind: 'error', status: t.status, message: t.body.message ?? '' };
		throw thrown;
	}
}
