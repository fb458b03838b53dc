// Helpers for server tests: a real, freshly migrated in-memory SQLite database and hand-built
// SvelteKit request events, so route handlers run exactly as in the server (no mocks of Kysely).
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { RequestEvent } from '@sveltejs/kit';
import type { CanMap } from '../can/map';
import { parseMap } from '../can/map-json';
import type { Role } from '../roles';
import { loadConfig, type AppConfig } from './config';
import { createDatabase, migrateToLatest, type DB } from './db';
import { createPostgresDatabase, isPostgresUrl } from './db/postgres';
import type { SessionUser } from './guard';
import { createMailLimits } from './mail/limits';
import type { OutgoingMail } from './mail/send';
import type { Services } from './services';
import type { BearerCredential } from './tokens/bearer';
import { createLocalStorage } from './storage';
import { saveDraft } from './maps/drafts';
import { createMap } from './maps/maps';
import { publishRevision } from './maps/revisions';
import { createWorkspace } from './workspaces/workspaces';

export async function createTestDatabase(): Promise<DB> {
	// Opt-in: the same tests against PostgreSQL (docs/scale-out.md), each in an empty database of its own.
	const url = process.env.TEST_DATABASE_URL;
	const db = isPostgresUrl(url)
		? await createPostgresDatabase(url, `t_${crypto.randomUUID().replaceAll('-', '')}`)
		: createDatabase(':memory:');
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
	// Each test's own store in a fresh temporary folder, removed after the test file
	// (tests/vitest-setup.ts).
	const storageRoot = mkdtempSync(join(tmpdir(), 'fw-test-storage-'));
	return {
		db,
		config,
		outbox,
		storage: createLocalStorage({ root: storageRoot, maxBytes: 4 * config.captureMaxBytes }),
		storageRoot,
		mailLimits: createMailLimits(config),
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

/** Makes a user a member with this role, as an accepted invitation would (setup only: no audit row). */
export async function addMember(
	db: DB,
	workspaceId: string,
	userId: string,
	role: Role
): Promise<void> {
	await db
		.insertInto('memberships')
		.values({
			workspace_id: workspaceId,
			user_id: userId,
			role,
			joined_at: new Date().toISOString()
		})
		.execute();
}

export type TeamMember = 'owner' | 'editor' | 'viewer' | 'outsider';

export interface Team {
	workspace: { id: string; slug: string; name: string };
	/** owner created the workspace; editor and viewer are members; outsider is signed in but not a member. */
	users: Record<TeamMember, SessionUser>;
}

/** A workspace with one user per role and an outsider (`<role>@example.test`, optional display names). */
export async function createTeam(
	db: DB,
	name: string,
	displayNames: Partial<Record<TeamMember, string>> = {}
): Promise<Team> {
	const user = (who: TeamMember) =>
		createUser(db, `${who}@example.test`, displayNames[who] ?? null);
	const users = {
		owner: await user('owner'),
		editor: await user('editor'),
		viewer: await user('viewer'),
		outsider: await user('outsider')
	};
	const workspace = await createWorkspace(db, { name, ownerId: users.owner.id });
	await addMember(db, workspace.id, users.editor.id, 'editor');
	await addMember(db, workspace.id, users.viewer.id, 'viewer');
	return { workspace, users };
}

/** The text of a file in fixtures/ (the invented demo scenario). */
export function fixtureText(fileName: string): string {
	return readFileSync(new URL(`../../../fixtures/${fileName}`, import.meta.url), 'utf8');
}

/** A demo map from fixtures/, parsed as an import would. */
export function fixtureMap(fileName: string): CanMap {
	const parsed = parseMap(fixtureText(fileName));
	if (!parsed.ok) throw new Error(`fixtures/${fileName} does not parse`);
	return parsed.map;
}

/**
 * A map published as r1, r2, … (one per entry of `revisions`), optionally with an unpublished
 * `draft` saved on top. Returns the map's id.
 */
export async function createPublishedMap(
	db: DB,
	input: { workspaceId: string; actorId: string; revisions: CanMap[]; draft?: CanMap }
): Promise<string> {
	const { workspaceId, actorId } = input;
	const [first, ...later] = input.revisions;
	const { id: mapId } = await createMap(db, { workspaceId, map: first, actorId, source: 'json' });
	let version = 1;
	await publishRevision(db, { workspaceId, mapId, version, actorId, note: 'r1' });
	for (const [k, map] of later.entries()) {
		({ version } = await saveDraft(db, { workspaceId, mapId, version, draft: map, actorId }));
		await publishRevision(db, { workspaceId, mapId, version, actorId, note: `r${k + 2}` });
	}
	if (input.draft)
		await saveDraft(db, { workspaceId, mapId, version, draft: input.draft, actorId });
	return mapId;
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
	/** Added to the path: `?kind=map`. */
	query?: string;
	headers?: Record<string, string>;
	/** The request's `Authorization: Bearer` credential, as the request pipeline read it. */
	bearer?: BearerCredential | null;
	/** A request made elsewhere (a test server's), used as it is instead of one built from `body`. */
	request?: Request;
}

/** A RequestEvent good enough for our loads, actions and +server.ts handlers. */
export function makeEvent<E = RequestEvent>(init: EventInit): E {
	const params = init.params ?? {};
	const path =
		init.path ?? init.routeId.replace(/\[(\w+)\]/g, (_, name: string) => params[name] ?? name);
	const url = new URL(`http://localhost${path}${init.query ?? ''}`);
	let body: BodyInit | undefined;
	const headers = new Headers(init.headers);
	if (init.body instanceof FormData || typeof init.body === 'string') body = init.body;
	else if (init.body !== undefined) {
		body = JSON.stringify(init.body);
		headers.set('content-type', 'application/json');
	}
	const request =
		init.request ??
		new Request(url, {
			method: init.method ?? (body ? 'POST' : 'GET'),
			body,
			headers
		});
	const cookies = new Map<string, string>();
	return {
		locals: { services: init.services, user: init.user, bearer: init.bearer ?? null },
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

/** A posted form, as a browser sends it (every value a string). */
export function formBody(fields: Record<string, string | number>): FormData {
	const form = new FormData();
	for (const [name, value] of Object.entries(fields)) form.append(name, String(value));
	return form;
}

/** Fresh services with a team in them (see `createTeam`), as a page's tests start. */
export async function createTeamServices(
	name: string,
	displayNames: Partial<Record<TeamMember, string>> = {}
): Promise<Team & { services: TestServices; db: DB }> {
	const services = await createTestServices();
	return { services, db: services.db, ...(await createTeam(services.db, name, displayNames)) };
}

/**
 * Events for one page route (its loads and form actions): who sends it, the posted form (fields
 * or a ready `FormData`; none for a load) and what follows the path (`?kind=map`).
 */
export function pageEvents(services: Services, routeId: string, params: Record<string, string>) {
	return (
		user: SessionUser | null,
		body?: Record<string, string | number> | FormData,
		query?: string
	): never =>
		makeEvent({
			services,
			user,
			routeId,
			params,
			query,
			body: body === undefined || body instanceof FormData ? body : formBody(body)
		});
}
