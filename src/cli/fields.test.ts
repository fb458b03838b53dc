import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { idProposalsSchema } from '../lib/can/fields';
import { plantedFrames } from '../lib/can/testing/planted-capture';

// Runs the real CLI in a child process, as scripts and CI pipelines do.
const ROOT = new URL('../../', import.meta.url).pathname;
const CLUB_CSV = 'fixtures/club-racer-session.csv';

function cli(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	return new Promise((resolve) => {
		execFile(
			process.execPath,
			['--import', 'tsx', 'src/cli/index.ts', ...args],
			{ cwd: ROOT, maxBuffer: 64 << 20 },
			(error, stdout, stderr) => {
				resolve({
					code: error ? (typeof error.code === 'number' ? error.code : 1) : 0,
					stdout,
					stderr
				});
			}
		);
	});
}

/** The capture's rows by ID, read with a plain split (independent of the importer). */
function rowsById(path: string) {
	const byId = new Map<number, Uint8Array[]>();
	for (const line of readFileSync(join(ROOT, path), 'utf8').trim().split('\n').slice(1)) {
		const [, id, , , data] = line.split(',');
		const bytes = Uint8Array.from(data.split(' '), (h) => Number.parseInt(h, 16));
		const key = Number.parseInt(id, 16);
		byId.set(key, [...(byId.get(key) ?? []), bytes]);
	}
	return byId;
}

const tempFile = (name: string, text: string) => {
	const path = join(mkdtempSync(join(tmpdir(), 'fw-fields-')), name);
	writeFileSync(path, text);
	return path;
};

describe('cli fields', () => {
	it('lists every ID of the club racer session with its frame count, each valid by the schema', async () => {
		const { code, stdout, stderr } = await cli('fields', CLUB_CSV);
		expect(stderr).toBe('');
		expect(code).toBe(0);
		const { ids } = JSON.parse(stdout);
		const rows = rowsById(CLUB_CSV);
		expect(ids.map((x: { id: number }) => x.id)).toEqual([...rows.keys()].sort((a, b) => a - b));
		for (const entry of ids) {
			expect(idProposalsSchema.parse(entry)).toEqual(entry);
			expect(entry.frames).toBe(rows.get(entry.id)!.length);
		}
	});

	it('finds the rolling counter and the constant byte of undocumented ID 0x5F8', async () => {
		const { code, stdout } = await cli('fields', CLUB_CSV, '--id', '0x5F8');
		expect(code).toBe(0);
		const { ids } = JSON.parse(stdout);
		expect(ids).toHaveLength(1);
		expect(ids[0]).toMatchObject({ id: 0x5f8, extended: false, payloadLength: 4 });
		// What the file holds, read by hand: byte 0's low nibble adds 1 modulo 16 in every frame, byte 3
		// is the same in every frame.
		const frames = rowsById(CLUB_CSV).get(0x5f8)!;
		frames.slice(1).forEach((f, i) => expect((f[0] & 15) - ((frames[i][0] + 1) & 15)).toBe(0));
		const byte3 = frames[0][3];
		expect(frames.every((f) => f[3] === byte3)).toBe(true);
		expect(ids[0].fields).toContainEqual(
			expect.objectContaining({
				kind: 'counter',
				startBit: 0,
				length: 4,
				byteOrder: 'little',
				step: 1,
				share: 1
			})
		);
		expect(ids[0].fields).toContainEqual(
			expect.objectContaining({ kind: 'constant', startBit: 24, length: 8, value: byte3 })
		);
	});

	it('reads a capture CSV with planted fields and names them', async () => {
		// Canonical CSV written here from frames with a planted counter, CRC-8/AUTOSAR with data ID 0x21
		// and a big-endian value (testing/planted-capture.ts builds them with reference code).
		const { time, payloads } = plantedFrames({
			seed: 21,
			frames: 2000,
			payloadLength: 8,
			period: 0.01,
			fields: [
				{ kind: 'noise', startBit: 8, length: 8 },
				{
					kind: 'value',
					startBit: 24,
					length: 16,
					byteOrder: 'big',
					signed: false,
					speed: 120,
					accel: 12
				},
				{ kind: 'noise', startBit: 32, length: 16 },
				{ kind: 'counter', startBit: 48, length: 4, byteOrder: 'little', step: 1 },
				{ kind: 'noise', startBit: 52, length: 12 },
				{ kind: 'checksum', byte: 0, algorithm: 'crc8-autosar', dataId: 0x21, clearedBits: [] }
			]
		});
		const hex = (p: Uint8Array) =>
			Array.from(p, (b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');
		const csv = [
			'time,id,extended,dlc,data',
			...payloads.map((p, i) => `${time[i].toFixed(6)},18DA10F1,1,8,${hex(p)}`)
		].join('\n');
		const { code, stdout } = await cli('fields', tempFile('planted.csv', `${csv}\n`));
		expect(code).toBe(0);
		const [entry] = JSON.parse(stdout).ids;
		expect(entry).toMatchObject({ id: 0x18da10f1, extended: true, frames: 2000 });
		expect(entry.fields).toContainEqual(
			expect.objectContaining({
				kind: 'checksum',
				startBit: 0,
				algorithm: 'crc8-autosar',
				dataId: 0x21,
				share: 1
			})
		);
		expect(entry.fields).toContainEqual(
			expect.objectContaining({ kind: 'counter', startBit: 48, length: 4, step: 1 })
		);
		expect(entry.fields).toContainEqual(
			expect.objectContaining({ kind: 'value', startBit: 24, length: 16, byteOrder: 'big' })
		);
	});

	it.concurrent.each([
		[['fields'], 2, /argument: CAPTURE\.csv is required/],
		[['fields', CLUB_CSV, '--id', '5F8'], 2, /--id: ID "5F8" must be hex with a 0x prefix/],
		[['fields', CLUB_CSV, '--id', '0x123'], 1, /ID 0x123 does not occur in the capture/],
		[['fields', 'missing.csv'], 1, /missing\.csv: no such file/],
		[['fields', CLUB_CSV, '--map', 'x.json'], 2, /fields: Unknown option '--map'/]
	])('%j exits %i with a one-line message', async (args, exitCode, message) => {
		const { code, stdout, stderr } = await cli(...args);
		expect(code).toBe(exitCode);
		expect(stdout).toBe('');
		expect(stderr.trim().split('\n')).toHaveLength(1);
		expect(stderr).toMatch(message);
	});

	it('exits 1 with one line when no row of the capture can be read', async () => {
		const path = tempFile('bad.csv', 'time,id,extended,dlc,data\n0,5F0,0,8,01XX\n0.1,5F0,0,8,ZZ\n');
		const { code, stdout, stderr } = await cli('fields', path);
		expect(code).toBe(1);
		expect(stdout).toBe('');
		expect(stderr.trim().split('\n')).toHaveLength(1);
		expect(stderr).toContain(`${path}: Could not recognise the capture's columns (row 2: "01XX"`);
	});

	it('reports bad rows by line and still analyses the good ones', async () => {
		const good = Array.from(
			{ length: 30 },
			(_, i) => `${i / 100},5F0,0,2,${i % 2 ? 'AA' : '55'} 0${i % 8}`
		);
		const path = tempFile(
			'mixed.csv',
			['time,id,extended,dlc,data', ...good, '0.5,5F0,0,2,ZZ'].join('\n')
		);
		const { code, stdout, stderr } = await cli('fields', path);
		expect(code).toBe(0);
		expect(stderr).toContain(`${path}:32: "ZZ" is not hex bytes`);
		const [entry] = JSON.parse(stdout).ids;
		expect(entry).toMatchObject({ id: 0x5f0, frames: 30 });
		// Bits 8–10 count 0…7, one per frame.
		expect(entry.fields).toContainEqual(
			expect.objectContaining({ kind: 'counter', startBit: 8, length: 3, step: 1 })
		);
	});

	it('prints its usage with --help', async () => {
		const { code, stdout } = await cli('fields', '--help');
		expect(code).toBe(0);
		expect(stdout).toMatch(/^Usage: fields CAPTURE\.csv \[--id ID\]/);
	});
});
