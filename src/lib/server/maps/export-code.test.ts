// The C code download of a revision page (GET /w/[ws]/maps/[mapId]/codegen): the two files of one
// revision compile together with the machine's gcc under the flags docs/codegen.md promises
// (-std=c99 -Wall -Wextra -Werror), their header comment names the map, the revision and the
// generator's version, and a bad prefix or an unknown revision is refused. The club racer map is
// the invented demo scenario. Skipped, saying so, without gcc.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CODEGEN_VERSION } from '../../can/codegen/generate';
import * as codegenRoute from '../../../routes/w/[ws]/maps/[mapId]/codegen/+server';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	makeEvent,
	outcome
} from '../test-support';

const HAS_GCC = spawnSync('gcc', ['--version']).status === 0;
if (!HAS_GCC) console.warn('gcc is not installed: the compile check of the C download is skipped');

const dir = mkdtempSync(join(tmpdir(), 'fw-code-download-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function world() {
	const services = await createTestServices();
	const { workspace, users } = await createTeam(services.db, 'Firmware team');
	const club = fixtureMap('club-racer-ecu.map.json');
	const mapId = await createPublishedMap(services.db, {
		workspaceId: workspace.id,
		actorId: users.editor.id,
		revisions: [club],
		draft: { ...club, bitrate: 250_000 }
	});
	const download = (query: string) =>
		codegenRoute.GET(
			makeEvent<never>({
				services,
				user: users.viewer,
				routeId: '/w/[ws]/maps/[mapId]/codegen',
				params: { ws: workspace.slug, mapId },
				path: `/w/${workspace.slug}/maps/${mapId}/codegen?${query}`
			})
		);
	return { club, download };
}

describe('C code download', () => {
	it.skipIf(!HAS_GCC)('gives the header and source of r1 that compile together', async () => {
		const { club, download } = await world();
		const header = await download('rev=1&file=h&prefix=ecu');
		const source = await download('rev=1&file=c&prefix=ecu');
		expect(header.headers.get('content-type')).toMatch(/^text\/x-c/);
		expect(header.headers.get('content-disposition')).toContain('filename="ecu.h"');
		expect(source.headers.get('content-disposition')).toContain('filename="ecu.c"');
		expect(header.headers.get('x-framewright-revision')).toBe('r1');
		const h = await header.text();
		const c = await source.text();
		expect(h).toContain(club.name);
		expect(h).toMatch(/Revision:\s+r1\b/);
		expect(h).toContain(`Framewright codegen ${CODEGEN_VERSION}`);
		expect(c).toContain('#include "ecu.h"');
		writeFileSync(join(dir, 'ecu.h'), h);
		writeFileSync(join(dir, 'ecu.c'), c);
		const gcc = spawnSync(
			'gcc',
			['-std=c99', '-Wall', '-Wextra', '-Werror', '-c', 'ecu.c', '-o', 'ecu.o'],
			{ cwd: dir, encoding: 'utf8' }
		);
		expect(gcc.stderr).toBe('');
		expect(gcc.status).toBe(0);
	});

	it('names the draft with its version, and refuses a bad prefix or an unknown revision', async () => {
		const { download } = await world();
		const draft = await (await download('rev=draft&file=h')).text();
		expect(draft).toMatch(/Revision:\s+draft, version 2 \(unpublished\)/);
		expect(await outcome(() => download('rev=1&file=h&prefix=int8'))).toMatchObject({
			kind: 'error',
			status: 400
		});
		expect(await outcome(() => download('rev=1&file=x'))).toMatchObject({
			kind: 'error',
			status: 400
		});
		expect(await outcome(() => download('rev=9&file=h'))).toMatchObject({
			kind: 'error',
			status: 404
		});
	});
});
