import { execFile, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

// Runs the real CLI in a child process, as a firmware build script would.
const ROOT = new URL('../../', import.meta.url).pathname;
const CLUB_MAP = 'fixtures/club-racer-ecu.map.json';
const CLUB_CSV = 'fixtures/club-racer-session.csv';
const HAS_GCC = spawnSync('gcc', ['--version']).status === 0;

function cli(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	return new Promise((resolve) => {
		execFile(
			process.execPath,
			['--import', 'tsx', 'src/cli/index.ts', ...args],
			{ cwd: ROOT },
			(error, stdout, stderr) =>
				resolve({
					code: error ? (typeof error.code === 'number' ? error.code : 1) : 0,
					stdout,
					stderr
				})
		);
	});
}

const temporary = () => mkdtempSync(join(tmpdir(), 'fw-cli-codegen-'));

describe('cli codegen', () => {
	it('writes <prefix>.h and <prefix>.c for the club racer map and prints a summary', async () => {
		const out = join(temporary(), 'generated'); // created by the command
		const { code, stdout, stderr } = await cli(
			'codegen',
			'--map',
			CLUB_MAP,
			'--out',
			out,
			'--prefix',
			'club',
			'--revision',
			'r3'
		);
		expect(stderr).toBe('');
		expect(code).toBe(0);
		const map = JSON.parse(readFileSync(join(ROOT, CLUB_MAP), 'utf8'));
		const signals = map.frames.reduce(
			(sum: number, f: { signals: unknown[] }) => sum + f.signals.length,
			0
		);
		expect(JSON.parse(stdout)).toEqual({
			files: [join(out, 'club.h'), join(out, 'club.c')],
			prefix: 'club',
			frames: map.frames.length,
			signals,
			notes: []
		});
		const header = readFileSync(join(out, 'club.h'), 'utf8');
		expect(header).toContain(` * Map:       ${map.name}`);
		expect(header).toContain(' * Revision:  r3');
		expect(header).toMatch(/ \* Generator: Framewright codegen \d+\.\d+\.\d+/);
		expect(readFileSync(join(out, 'club.c'), 'utf8')).toContain('#include "club.h"');
	});

	it.skipIf(!HAS_GCC)(
		'gives firmware that decodes a captured EngineCore frame as DataView reads it',
		async () => {
			const out = temporary();
			expect((await cli('codegen', '--map', CLUB_MAP, '--out', out)).code).toBe(0);
			// The example of docs/codegen.md, fed the first EngineCore (0x5F0) row of the session capture.
			const row = readFileSync(join(ROOT, CLUB_CSV), 'utf8')
				.split('\n')
				.find((line) => line.split(',')[1] === '5F0')!;
			const bytes = row.split(',')[4].split(' ');
			writeFileSync(
				join(out, 'main.c'),
				[
					'#include <stdio.h>',
					'#include "fw.h"',
					'int main(void)',
					'{',
					`\tconst uint8_t data[8] = { ${bytes.map((b) => `0x${b}`).join(', ')} };`,
					'\tfw_engine_core_t core;',
					'\tif (fw_engine_core_decode(data, sizeof data, &core) != 0)',
					'\t\treturn 1;',
					'\tprintf("%.17g %.17g\\n", core.engine_speed, core.throttle_position);',
					'\treturn 0;',
					'}',
					''
				].join('\n')
			);
			const compiled = spawnSync(
				'gcc',
				['-std=c99', '-Wall', '-Wextra', '-Werror', 'main.c', 'fw.c', '-o', 'main'],
				{ cwd: out }
			);
			expect(compiled.stderr.toString()).toBe('');
			const [speed, throttle] = spawnSync(join(out, 'main')).stdout.toString().trim().split(' ');
			// EngineSpeed: bytes 0–1 big-endian, 1 rpm/bit; ThrottlePosition: bytes 2–3 big-endian, 0.1 %/bit.
			const view = new DataView(Uint8Array.from(bytes, (b) => Number.parseInt(b, 16)).buffer);
			expect(Number(speed)).toBe(view.getUint16(0, false));
			expect(Number(throttle)).toBe(view.getUint16(2, false) * 0.1);
		}
	);

	it.skipIf(!HAS_GCC)(
		'compiles the example of docs/codegen.md against the club racer map',
		async () => {
			const out = temporary();
			expect((await cli('codegen', '--map', CLUB_MAP, '--out', out)).code).toBe(0);
			const doc = readFileSync(join(ROOT, 'docs/codegen.md'), 'utf8');
			const example = /## Example[\s\S]*?```c\n([\s\S]*?)```/.exec(doc)![1];
			writeFileSync(join(out, 'example.c'), example);
			const compiled = spawnSync(
				'gcc',
				['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic', '-c', 'example.c'],
				{ cwd: out }
			);
			expect(compiled.stderr.toString()).toBe('');
			expect(compiled.status).toBe(0);
		}
	);

	it('prints each renamed identifier as a note on stderr and in the summary', async () => {
		const dir = temporary();
		const mapFile = join(dir, 'names.json');
		writeFileSync(
			mapFile,
			JSON.stringify({
				format: 'framewright-map@1',
				name: 'names',
				frames: [
					{
						name: 'F',
						id: '0x100',
						signals: [
							{ name: 'int', startBit: 0, length: 8 },
							{ name: 'Int', startBit: 8, length: 8 }
						]
					}
				]
			})
		);
		const { code, stdout, stderr } = await cli('codegen', '--map', mapFile, '--out', dir);
		expect(code).toBe(0);
		expect(stderr.trim().split('\n')).toEqual([
			'note: frames[0].signals[0]: "int" is named s_int: int is a C or C++ keyword or standard macro',
			'note: frames[0].signals[1]: "Int" is named s_int_2: int is a C or C++ keyword or standard macro, and s_int is already used by another name'
		]);
		expect(JSON.parse(stdout).notes).toHaveLength(2);
		expect(readFileSync(join(dir, 'fw.h'), 'utf8')).toMatch(/double s_int;[\s\S]*double s_int_2;/);
	});

	it('replaces its own files and leaves other files in the folder alone', async () => {
		const out = temporary();
		writeFileSync(join(out, 'fw.h'), 'old');
		writeFileSync(join(out, 'notes.txt'), 'keep me');
		expect((await cli('codegen', '--map', CLUB_MAP, '--out', out)).code).toBe(0);
		expect(readFileSync(join(out, 'fw.h'), 'utf8')).toMatch(/^\/\*/);
		expect(readFileSync(join(out, 'notes.txt'), 'utf8')).toBe('keep me');
	});

	it.concurrent.each([
		['without --out', ['--map', CLUB_MAP], 2, /--out DIR is required/],
		['without --map', ['--out', 'x'], 2, /--map MAP.json is required/],
		['a bad prefix', ['--map', CLUB_MAP, '--prefix', 'My-ECU'], 2, /--prefix: prefix must start/],
		['a reserved prefix', ['--map', CLUB_MAP, '--prefix', 'int'], 2, /C standard library reserves/],
		['a stray argument', ['--map', CLUB_MAP, 'extra.json'], 2, /takes no file arguments/],
		['a missing map', ['--map', 'fixtures/nope.json'], 1, /nope.json: no such file/],
		['a capture as map', ['--map', CLUB_CSV], 1, /is not a valid map: JSON syntax error/]
	] as [string, string[], number, RegExp][])(
		'refuses %s with one line and writes nothing',
		async (name, args, exitCode, message) => {
			const out = join(temporary(), 'never');
			// every case but the one about --out names a folder that must stay unmade
			const withOut =
				name === 'without --out' || args.includes('--out') ? args : [...args, '--out', out];
			const { code, stdout, stderr } = await cli('codegen', ...withOut);
			expect(code).toBe(exitCode);
			expect(stderr).toMatch(message);
			expect(stderr.trim().split('\n')).toHaveLength(1);
			expect(stdout).toBe('');
			expect(existsSync(out)).toBe(false);
		}
	);

	it('refuses an --out that is a file, keeping the file', async () => {
		const file = join(temporary(), 'taken');
		writeFileSync(file, 'precious');
		const { code, stderr } = await cli('codegen', '--map', CLUB_MAP, '--out', file);
		expect(code).toBe(1);
		expect(stderr).toBe(`error: ${file}: is a file, not a folder\n`);
		expect(readFileSync(file, 'utf8')).toBe('precious');
	});
});
