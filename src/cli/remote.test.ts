// The command line against a server: the real CLI in child processes, as a build script runs it,
// talking HTTP to the app's own route handlers (src/lib/server/test-server.ts) on a freshly migrated
// database, with access tokens made for the test. Expected values come from elsewhere: the pulled
// map must equal the fixture that was published, a remotely decoded CSV must agree with the local
// `decode` command over the same file, counts come from the capture's own lines. Fixtures are the
// invented demo scenario.
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseMap } from '../lib/can/map-json';
import type { CanMap } from '../lib/can/map';
import { saveDraft } from '../lib/server/maps/drafts';
import { startTestServer } from '../lib/server/test-server';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	type TestServices
} from '../lib/server/test-support';
import { createToken } from '../lib/server/tokens/tokens';
import { createWorkspace } from '../lib/server/workspaces/workspaces';

const ROOT = new URL('../../', import.meta.url).pathname;
const CLUB_CSV = join(ROOT, 'fixtures/club-racer-session.csv');
const MAP_NAME = 'Club racer engine controller';

interface Run {
	code: number;
	stdout: string;
	stderr: string;
}

function cli(env: Record<string, string>, ...args: string[]): Promise<Run> {
	return new Promise((resolve) => {
		execFile(
			process.execPath,
			['--import', 'tsx', 'src/cli/index.ts', ...args],
			{ cwd: ROOT, env: { ...process.env, ...env }, maxBuffer: 64 << 20 },
			(error, stdout, stderr) =>
				resolve({
					code: error ? (typeof error.code === 'number' ? error.code : 1) : 0,
					stdout,
					stderr
				})
		);
	});
}

let services: TestServices;
let server: { url: string; close: () => Promise<void> };
let dir: string;
let club: CanMap;
const tokens: Record<'read' | 'edit' | 'other', string> = { read: '', edit: '', other: '' };
const as = (which: keyof typeof tokens) => ({ FRAMEWRIGHT_TOKEN: tokens[which] });

beforeAll(async () => {
	services = await createTestServices();
	server = await startTestServer(services);
	dir = mkdtempSync(join(tmpdir(), 'fw-cli-remote-'));
	const { workspace, users } = await createTeam(services.db, 'Remote team', {
		editor: 'Cal Ibrator'
	});
	club = fixtureMap('club-racer-ecu.map.json');
	await createPublishedMap(services.db, {
		workspaceId: workspace.id,
		actorId: users.editor.id,
		revisions: [club]
	});
	const make = async (userId: string, workspaceId: string, role: 'viewer' | 'editor') =>
		(await createToken(services.db, { workspaceId, userId, name: role, role, expiresInDays: 7 }))
			.token;
	tokens.read = await make(users.viewer.id, workspace.id, 'viewer');
	tokens.edit = await make(users.editor.id, workspace.id, 'editor');
	// The editor's token for another workspace of theirs, where no map exists.
	const other = await createWorkspace(services.db, { name: 'Elsewhere', ownerId: users.editor.id });
	tokens.other = await make(users.editor.id, other.id, 'editor');
}, 60_000);

afterAll(async () => {
	await server?.close();
	rmSync(dir, { recursive: true, force: true });
	rmSync(services.storageRoot, { recursive: true, force: true });
});

// Each command is a fresh Node process with tsx; on a shared, busy machine a test running several
// of them needs more than the default 30 s.
describe('remote commands', { timeout: 120_000 }, () => {
	it('maps lists the token’s workspace only', async () => {
		const mine = await cli(as('read'), 'maps', '--server', server.url);
		expect(mine.stderr).toBe('');
		expect(mine.code).toBe(0);
		const listed = JSON.parse(mine.stdout);
		expect(listed.workspace).toMatchObject({ name: 'Remote team', role: 'viewer' });
		expect(listed.maps).toMatchObject([{ name: MAP_NAME, latestRevision: 1, frameCount: 6 }]);
		const elsewhere = JSON.parse((await cli(as('other'), 'maps', '--server', server.url)).stdout);
		expect(elsewhere).toMatchObject({ workspace: { name: 'Elsewhere' }, maps: [] });
	});

	it('pull gives back the published map, to stdout or a file, and the draft with its version', async () => {
		const out = await cli(
			as('read'),
			'pull',
			'--server',
			server.url,
			'--map',
			MAP_NAME.toUpperCase()
		);
		expect(out.code).toBe(0);
		const pulled = parseMap(out.stdout);
		expect(pulled.ok && pulled.map).toEqual(club);

		const file = join(dir, 'r1.map.json');
		const saved = await cli(
			as('read'),
			'pull',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--revision',
			'r1',
			'--out',
			file
		);
		expect(JSON.parse(saved.stdout)).toMatchObject({ file, revision: 'r1', version: null });
		expect(readFileSync(file, 'utf8')).toBe(out.stdout);

		const draft = await cli(
			as('read'),
			'pull',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--revision',
			'draft'
		);
		expect(draft.stderr).toMatch(/^draft version \d+$/m);
	});

	it('lint reports the server’s problems and exits 1 on errors', async () => {
		const clean = await cli(as('read'), 'lint', '--server', server.url, '--map', MAP_NAME);
		expect(clean.code).toBe(0);
		expect(
			JSON.parse(clean.stdout).filter((p: { severity: string }) => p.severity === 'error')
		).toEqual([]);
		const none = await cli(as('read'), 'lint', '--server', server.url, '--map', 'No such map');
		expect(none.code).toBe(1);
		expect(none.stderr).toMatch(/^error: no map "No such map" in Remote team/);
	});

	it('push refuses a stale version saying who changed the draft and when, then saves; publish makes r2', async () => {
		const file = join(dir, 'draft.map.json');
		const pulled = await cli(
			as('edit'),
			'pull',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--revision',
			'draft',
			'--out',
			file
		);
		const { version } = JSON.parse(pulled.stdout) as { version: number };
		// Someone saves the draft meanwhile (the editor, in the browser).
		const map = await services.db
			.selectFrom('maps')
			.select(['id', 'workspace_id'])
			.executeTakeFirstOrThrow();
		const editor = await services.db
			.selectFrom('User')
			.select('id')
			.where('email', '=', 'editor@example.test')
			.executeTakeFirstOrThrow();
		await saveDraft(services.db, {
			workspaceId: map.workspace_id,
			mapId: map.id,
			version,
			draft: { ...club, bitrate: 250_000 },
			actorId: editor.id
		});
		const edited = {
			...club,
			frames: club.frames.map((f, i) => (i === 0 ? { ...f, cycleMs: 25 } : f))
		};
		writeFileSync(file, JSON.stringify({ ...edited, format: 'framewright-map@1' }));

		const stale = await cli(
			as('edit'),
			'push',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--version',
			String(version),
			file
		);
		expect(stale.code).toBe(1);
		expect(stale.stdout).toBe('');
		expect(stale.stderr).toMatch(
			new RegExp(
				`changed after version ${version}: it is at version ${version + 1}, saved by Cal Ibrator <editor@example.test> at \\d{4}-\\d\\d-\\d\\dT`
			)
		);
		expect(stale.stderr).toContain(`--version ${version + 1}`);
		expect(stale.stderr.trim().split('\n')).toHaveLength(1);

		const readOnly = await cli(
			as('read'),
			'push',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--version',
			String(version + 1),
			file
		);
		expect(readOnly.code).toBe(1);
		expect(readOnly.stderr).toMatch(/needs the editor role.*HTTP 403/);

		const pushed = await cli(
			as('edit'),
			'push',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--version',
			String(version + 1),
			file
		);
		expect(pushed.code).toBe(0);
		const saved = JSON.parse(pushed.stdout) as { version: number };
		expect(saved.version).toBe(version + 2);

		const published = await cli(
			as('edit'),
			'publish',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--version',
			String(saved.version),
			'--note',
			'Faster engine frame'
		);
		expect(published.code).toBe(0);
		expect(JSON.parse(published.stdout)).toMatchObject({ revision: { number: 2 } });
		const latest = parseMap(
			(await cli(as('read'), 'pull', '--server', server.url, '--map', MAP_NAME)).stdout
		);
		expect(latest.ok && latest.map.frames[0].cycleMs).toBe(25);
		// The change is audited as the editor's, made with the token (r1 was published in the setup).
		const audit = await services.db
			.selectFrom('audit_log')
			.selectAll()
			.where('action', '=', 'map.publish')
			.execute();
		expect(audit.map((a) => a.token_id)).toEqual([null, tokens.edit.slice(4, 20)]);
	});

	it('upload streams and waits for processing; decode on the server agrees with decode of the file here', async () => {
		const uploaded = await cli(as('read'), 'upload', '--server', server.url, CLUB_CSV);
		expect(uploaded.code).toBe(0);
		expect(uploaded.stderr).toMatch(/^upload +100%/m);
		expect(uploaded.stderr).toMatch(/^processing done: \d+ frames$/m);
		const { capture, report } = JSON.parse(uploaded.stdout);
		const lines = readFileSync(CLUB_CSV, 'utf8').trim().split('\n').length - 1;
		expect(capture).toMatchObject({
			status: 'ready',
			frameCount: lines,
			name: 'club-racer-session.csv'
		});
		expect(report.badRowCount).toBe(0);

		const out = join(dir, 'decoded.csv');
		const remote = await cli(
			as('read'),
			'decode',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--revision',
			'1',
			'--out',
			out,
			capture.id
		);
		expect(remote.code).toBe(0);
		expect(remote.stderr).toMatch(
			/decoded "club-racer-session.csv" with "Club racer engine controller" r1: \d+ channels/
		);

		const mapFile = join(dir, 'for-local.map.json');
		await cli(
			as('read'),
			'pull',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--revision',
			'1',
			'--out',
			mapFile
		);
		const local = await cli({}, 'decode', '--map', mapFile, CLUB_CSV);
		const rows = (csv: string) =>
			csv
				.trim()
				.split('\n')
				.slice(1)
				.map((line) => {
					const [time, frame, signal, value, unit] = line.split(',');
					return { time: Number(time), frame, signal, value: Number(value), unit };
				});
		const fromServer = rows(readFileSync(out, 'utf8'));
		const fromFile = rows(local.stdout);
		expect(readFileSync(out, 'utf8').split('\n')[0]).toBe('time,frame,signal,value,unit');
		expect(fromServer.length).toBe(fromFile.length);
		expect(fromServer.length).toBeGreaterThan(lines);
		// Both sorted the same way, then compared sample by sample (times to the local 6 decimals).
		const key = (r: { time: number; frame: string; signal: string }) =>
			`${r.frame}/${r.signal}/${r.time.toFixed(6)}`;
		const byKey = new Map(fromFile.map((r) => [key(r), r.value]));
		for (const r of fromServer) expect(byKey.get(key(r)), key(r)).toBeCloseTo(r.value, 9);

		const byName = await cli(
			as('read'),
			'decode',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'club-racer-session.csv'
		);
		expect(byName.code).toBe(0);
		expect(byName.stdout.split('\n')[0]).toBe('time,frame,signal,value,unit');
	});

	it('bad settings and refused tokens are one line each with the usual exit codes', async () => {
		const noToken = await cli({ FRAMEWRIGHT_TOKEN: '' }, 'maps', '--server', server.url);
		expect(noToken.code).toBe(2);
		expect(noToken.stderr).toMatch(/^error: set FRAMEWRIGHT_TOKEN .*\(see --help\)\n$/);
		const badUrl = await cli(as('read'), 'maps', '--server', 'ftp://x');
		expect(badUrl.code).toBe(2);
		const noServer = await cli(as('read'), 'pull', '--map', MAP_NAME);
		expect(noServer.code).toBe(2);
		const wrong = await cli(
			{ FRAMEWRIGHT_TOKEN: `${tokens.read.slice(0, -2)}xx` },
			'maps',
			'--server',
			server.url
		);
		expect(wrong.code).toBe(1);
		expect(wrong.stderr).toMatch(/^error: The access token is not valid.*\[HTTP 401\]\n$/);
		const down = await cli(as('read'), 'maps', '--server', 'http://127.0.0.1:9');
		expect(down.code).toBe(1);
		expect(down.stderr).toMatch(/^error: cannot reach http:\/\/127\.0\.0\.1:9/);
		const localOnly = await cli(
			as('read'),
			'decode',
			'--server',
			server.url,
			'--map',
			MAP_NAME,
			'--strict',
			'x'
		);
		expect(localOnly.code).toBe(2);
		const remoteOnly = await cli(
			{},
			'lint',
			'--map',
			'fixtures/club-racer-ecu.map.json',
			'--revision',
			'1'
		);
		expect(remoteOnly.code).toBe(2);
		expect(remoteOnly.stderr).toMatch(/--revision: goes with --server/);
	});
});
