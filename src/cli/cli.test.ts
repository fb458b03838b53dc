import { execFile } from 'node:child_process';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { referenceFrameBits } from '../lib/can/testing/reference-frame-bits';

// Runs the real CLI in a child process, as scripts and CI pipelines do.
const ROOT = new URL('../../', import.meta.url).pathname;
const CLUB_MAP = 'fixtures/club-racer-ecu.map.json';
const CLUB_CSV = 'fixtures/club-racer-session.csv';
const GENSET_MAP = 'fixtures/genset-j1939.map.json';
const GENSET_CSV = 'fixtures/genset-idle.csv';
const DASH_PROFILE = 'fixtures/dash-display.profile.json';
const GENSET_PROFILE = 'fixtures/genset-panel.profile.json';

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

/** The capture's rows, read with a plain split (independent of the importer). */
function captureRows(path: string) {
	const lines = readFileSync(join(ROOT, path), 'utf8').trim().split('\n').slice(1);
	const rows = lines.map((line) => {
		const [time, id, , , data] = line.split(',');
		const bytes = Uint8Array.from(data.split(' '), (h) => Number.parseInt(h, 16));
		return { time: Number(time), id: Number.parseInt(id, 16), view: new DataView(bytes.buffer) };
	});
	const t0 = rows[0].time;
	return rows.map((r) => ({ ...r, time: r.time - t0 }));
}

function decodedRows(stdout: string) {
	const [header, ...lines] = stdout.trim().split('\n');
	return {
		header,
		rows: lines.map((line) => {
			const [time, frame, signal, value, unit] = line.split(',');
			return { time: Number(time), frame, signal, value: Number(value), unit };
		})
	};
}

describe('cli decode', () => {
	it('decodes the club racer session; values match raw × scale + offset read with DataView', async () => {
		const { code, stdout, stderr } = await cli('decode', '--map', CLUB_MAP, CLUB_CSV);
		expect(stderr).toBe('');
		expect(code).toBe(0);
		const { header, rows } = decodedRows(stdout);
		expect(header).toBe('time,frame,signal,value,unit');
		const series = (signal: string) => rows.filter((r) => r.signal === signal);
		const frames = (id: number) => captureRows(CLUB_CSV).filter((r) => r.id === id);

		// Reference: DataView getUint16/getInt16 (ECMAScript), big- or little-endian as the map declares;
		// byte-aligned fields only, so DataView reads them directly.
		const checks: [string, number, (v: DataView) => number][] = [
			['EngineSpeed', 0x5f0, (v) => v.getUint16(0, false) * 1],
			['ThrottlePosition', 0x5f0, (v) => v.getUint16(2, false) * 0.1],
			['Lambda', 0x5f0, (v) => v.getUint16(6, false) * 0.001],
			['CoolantTemp', 0x5f1, (v) => v.getUint8(0) - 40],
			['OilPressure', 0x5f2, (v) => v.getUint16(0, true) * 0.1],
			['LateralAccel', 0x610, (v) => v.getInt16(0, false) * 0.001],
			['SteeringAngle', 0x610, (v) => v.getInt16(4, false) * 0.1]
		];
		for (const [signal, id, reference] of checks) {
			const got = series(signal);
			const source = frames(id);
			expect(got.length, signal).toBe(source.length);
			got.forEach((row, i) => {
				expect(row.time).toBeCloseTo(source[i].time, 6);
				expect(row.value).toBeCloseTo(reference(source[i].view), 9);
			});
		}
		// Multiplexed frame: EcuTemp only on page 0, FuelUsed only on page 1 (byte 0 selects).
		const paged = frames(0x600);
		expect(series('EcuTemp').length).toBe(paged.filter((f) => f.view.getUint8(0) === 0).length);
		expect(series('FuelUsed').length).toBe(paged.filter((f) => f.view.getUint8(0) === 1).length);
		expect(series('FuelUsed').length).toBeGreaterThan(0);
		// The undocumented IDs 0x5F8 and 0x640 produce no rows.
		expect(new Set(rows.map((r) => r.frame))).toEqual(
			new Set([
				'EngineCore',
				'EngineTemperatures',
				'Pressures',
				'Drivetrain',
				'StatusPaged',
				'ChassisMotion'
			])
		);
	});

	it('decodes the genset capture with J1939 scaling', async () => {
		const { code, stdout } = await cli('decode', '--map', GENSET_MAP, GENSET_CSV);
		expect(code).toBe(0);
		const { rows } = decodedRows(stdout);
		const eec1 = captureRows(GENSET_CSV).filter((r) => r.id === 0x0cf00400);
		const speed = rows.filter((r) => r.signal === 'EngineSpeed');
		// SAE J1939-71 SPN 190: bytes 4–5 little-endian, 0.125 rpm/bit (from memory).
		expect(speed.map((r) => r.value)).toEqual(eec1.map((f) => f.view.getUint16(3, true) * 0.125));
		const coolant = rows.filter((r) => r.signal === 'CoolantTemp');
		const et1 = captureRows(GENSET_CSV).filter((r) => r.id === 0x18feee00);
		// SAE J1939-71 SPN 110: byte 1, 1 °C/bit, −40 °C offset (from memory).
		expect(coolant.map((r) => r.value)).toEqual(et1.map((f) => f.view.getUint8(0) - 40));
	});

	it('reports bad capture rows by line on stderr and keeps the good ones', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-cli-'));
		const path = join(dir, 'bad.csv');
		writeFileSync(
			path,
			'time,id,extended,dlc,data\n0,5F0,0,8,0102030405060708\n0.01,5F0,0,8,01XX\n0.02,5F0,0,8,0102030405060708\n'
		);
		const result = await cli('decode', '--map', CLUB_MAP, path);
		expect(result.code).toBe(0);
		expect(result.stderr).toContain(`${path}:3: "01XX" is not hex bytes`);
		expect(decodedRows(result.stdout).rows.filter((r) => r.signal === 'EngineSpeed')).toHaveLength(
			2
		);
		const strict = await cli('decode', '--strict', '--map', CLUB_MAP, path);
		expect(strict.code).toBe(1);
	});
});

describe('cli calculators', () => {
	it.concurrent.each([
		// SAE J1939-21: priority bits 28–26, PF bits 23–16, PS bits 15–8, SA bits 7–0; PF ≥ 240 is PDU2 (PS = group extension).
		['0x18FEF100', { priority: 6, pgn: 0xfef1, sourceAddress: 0x00, destinationAddress: null }],
		['0x0CF00400', { priority: 3, pgn: 0xf004, sourceAddress: 0x00, destinationAddress: null }],
		// PF 0xEA < 240: PDU1, PS is the destination address and is not part of the PGN.
		['0x18EA00F9', { priority: 6, pgn: 0xea00, sourceAddress: 0xf9, destinationAddress: 0x00 }],
		[
			String(0x18fef100),
			{ priority: 6, pgn: 0xfef1, sourceAddress: 0x00, destinationAddress: null }
		]
	])('j1939 %s', async (id, expected) => {
		const { code, stdout } = await cli('j1939', id);
		expect(code).toBe(0);
		expect(JSON.parse(stdout)).toEqual(expected);
	});

	it.concurrent.each([
		['0x123', false, '11 22 33'],
		['0x7FF', false, ''],
		['0x18FEF100', true, '0102030405060708']
	])('frame-bits --id %s extended=%s data=%s', async (id, extended, data) => {
		const args = ['frame-bits', '--id', id, '--data', data, ...(extended ? ['--extended'] : [])];
		const { code, stdout } = await cli(...args);
		expect(code).toBe(0);
		const result = JSON.parse(stdout);
		const n = data.replace(/ /g, '').length / 2;
		// ISO 11898-1: SOF…EOF unstuffed is 44 + 8n bits (base format) or 64 + 8n (extended).
		expect(result.bits).toBe((extended ? 64 : 44) + 8 * n);
		// Stuff bits and CRC-15 of this exact frame: the frame spelled out bit by bit from ISO 11898-1, its
		// CRC by polynomial long division, its stuff bits counted one at a time (testing/reference-frame-bits.ts).
		const bytes = Uint8Array.from(data.match(/[0-9a-f]{2}/gi) ?? [], (h) => Number.parseInt(h, 16));
		expect(result).toEqual(referenceFrameBits(Number.parseInt(id.slice(2), 16), extended, bytes));
	});

	it('bit-timing lists settings whose arithmetic gives the bit rate', async () => {
		const { code, stdout } = await cli('bit-timing', '--clock', '16M', '--bitrate', '500k');
		expect(code).toBe(0);
		const settings = JSON.parse(stdout);
		expect(settings.length).toBeGreaterThan(0);
		// ISO 11898-1: bit time = (1 sync + tseg1 + tseg2) quanta of prescaler / clock; sample point after sync + tseg1.
		for (const s of settings) {
			const rate = 16e6 / (s.prescaler * (1 + s.tseg1 + s.tseg2));
			expect(s.bitrateError).toBeCloseTo((rate - 500_000) / 500_000, 12);
			expect(s.samplePoint).toBeCloseTo((1 + s.tseg1) / (1 + s.tseg1 + s.tseg2), 12);
		}
		// 16 MHz / (2 × 16 quanta) is exactly 500 kbit/s with 14/16 = 87.5 %, the usual sample point at 500 kbit/s (common practice).
		expect(settings[0]).toMatchObject({ bitrateError: 0, samplePoint: 0.875 });
	});

	it('bus-load of a map follows from its cycle times and the standard frame lengths', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-cli-'));
		const path = join(dir, 'load.json');
		writeFileSync(
			path,
			JSON.stringify({
				format: 'framewright-map@1',
				name: 'load',
				bitrate: 500000,
				frames: [
					{ name: 'A', id: '0x100', length: 8, cycleMs: 10 },
					{ name: 'B', id: '0x101', length: 8, cycleMs: 20 },
					{ name: 'C', id: '0x18FF0001', extended: true, length: 8, cycleMs: 100 },
					{ name: 'OnEvent', id: '0x200', length: 2 }
				]
			})
		);
		const { code, stdout } = await cli('bus-load', '--map', path);
		expect(code).toBe(0);
		const load = JSON.parse(stdout);
		// Hand arithmetic. Nominal, unstuffed (ISO 11898-1) + 3-bit intermission: 8-byte base frame
		// 44 + 64 + 3 = 111 bits, 8-byte extended 64 + 64 + 3 = 131 bits. Worst case including the
		// intermission (Davis et al. 2007): 135 bits base, 160 bits extended. The event frame counts nothing.
		// Nominal: (100 + 50) × 111 + 10 × 131 = 17 960 bit/s = 3.592 % of 500 kbit/s.
		// Worst: 150 × 135 + 10 × 160 = 21 850 bit/s = 4.37 %.
		expect(load.bitrate).toBe(500000);
		expect(load.nominalPercent).toBeCloseTo(3.592, 9);
		expect(load.worstCasePercent).toBeCloseTo(4.37, 9);
		expect(load.frames.map((f: { excluded: string | null }) => f.excluded)).toEqual([
			null,
			null,
			null,
			'noCycleTime'
		]);
		// The same traffic on a 250 kbit/s bus: 7.184 % and 8.74 %.
		const at250 = JSON.parse((await cli('bus-load', '--map', path, '--bitrate', '250k')).stdout);
		expect(at250.nominalPercent).toBeCloseTo(7.184, 9);
		expect(at250.worstCasePercent).toBeCloseTo(8.74, 9);
	});

	it('bus-load runs a CAN FD frame’s data phase at --data-bitrate', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-cli-'));
		const path = join(dir, 'fd.map.json');
		// Invented test map: one classical and one 64-byte CAN FD frame, both every 10 ms.
		writeFileSync(
			path,
			JSON.stringify({
				format: 'framewright-map@1',
				name: 'FD load',
				bitrate: 500000,
				frames: [
					{ name: 'Classic', id: '0x100', length: 8, cycleMs: 10 },
					{ name: 'Wide', id: '0x300', length: 64, cycleMs: 10 }
				]
			})
		);
		const { code, stdout } = await cli('bus-load', '--map', path, '--data-bitrate', '2M');
		expect(code).toBe(0);
		const load = JSON.parse(stdout);
		// Classic: 108 + 3 = 111 bits (ISO 11898-1). Wide (ISO 11898-1:2015 FD layout, base format,
		// CRC-21): 26 bits at 500 kbit/s (SOF…BRS, ACK, EOF) + 3 intermission, 550 at 2 Mbit/s
		// (ESI…CRC delimiter with 7 fixed stuff bits) = 137.5 nominal bit times → 166.5.
		expect(load.dataBitrate).toBe(2_000_000);
		expect(load.nominalPercent).toBeCloseTo((100 * 100 * (111 + 166.5)) / 500_000, 9);
		const refused = await cli('bus-load', '--map', path, '--data-bitrate', '250k');
		expect(refused.code).toBe(2);
		expect(refused.stderr).toMatch(/data bit rate \(250000\) must be at least the nominal/);
	});

	it.concurrent.each([[CLUB_MAP], [GENSET_MAP]])('lint finds no problems in %s', async (path) => {
		const { code, stdout } = await cli('lint', '--map', path);
		expect(JSON.parse(stdout)).toEqual([]);
		expect(code).toBe(0);
	});

	it('lint reports overlapping bits and invalid JSON with exit 1', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-cli-'));
		const overlap = join(dir, 'overlap.json');
		writeFileSync(
			overlap,
			JSON.stringify({
				format: 'framewright-map@1',
				name: 'overlap',
				frames: [
					{
						name: 'F',
						id: '0x100',
						signals: [
							{ name: 'a', startBit: 0, length: 12 },
							{ name: 'b', startBit: 8, length: 8 }
						]
					}
				]
			})
		);
		const first = await cli('lint', '--map', overlap);
		expect(first.code).toBe(1);
		expect(
			JSON.parse(first.stdout).some(
				(p: { severity: string; code: string }) =>
					p.severity === 'error' && p.code === 'signal-overlap'
			)
		).toBe(true);

		const broken = join(dir, 'broken.json');
		writeFileSync(broken, '{\n  "format": "framewright-map@1",\n  "name": "x",,\n}');
		const second = await cli('lint', '--map', broken);
		expect(second.code).toBe(1);
		const [problem] = JSON.parse(second.stdout);
		expect(problem).toMatchObject({ severity: 'error', code: 'format' });
		expect(problem.message).toMatch(/line 3/);
	});
});

describe('cli receiver profiles', () => {
	it('link: JSON report with score, reason, conversion and composed scaling; exit 0', async () => {
		const { code, stdout, stderr } = await cli(
			'link',
			'--map',
			CLUB_MAP,
			'--profile',
			DASH_PROFILE
		);
		expect(stderr).toBe('');
		expect(code).toBe(0);
		const report = JSON.parse(stdout);
		expect(report.profile).toBe('Club dash display');
		const oil = report.links.find((l: { wanted: string }) => l.wanted === 'Oil pressure');
		expect(oil).toMatchObject({
			frame: 'Pressures',
			id: '0x5F2',
			signal: 'OilPressure',
			manual: false,
			conversion: { kind: 'units', from: 'kPa', to: 'bar', text: 'kPa → bar: × 0.01' },
			composed: { form: 'linear', offset: 0 }
		});
		// 0.1 kPa per bit (the map) and 1 bar = 100 kPa (NIST SP 811 B.8).
		expect(oil.composed.scale).toBeCloseTo(0.001, 15);
		expect(oil.score).toBeGreaterThanOrEqual(0.6);
		expect(oil.reason).toMatch(/oil pressure/);
		expect(report.unlinked).toEqual([
			expect.objectContaining({ wanted: 'Fuel level', required: false, candidates: [] })
		]);
	});

	it('link exits 1 naming a required channel that stays unlinked, and still prints the report', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-link-'));
		const profile = join(dir, 'p.json');
		const document = JSON.parse(readFileSync(join(ROOT, GENSET_PROFILE), 'utf8'));
		document.wanted.find((w: { name: string }) => w.name === 'Fuel level').required = true;
		writeFileSync(profile, JSON.stringify(document));
		const { code, stdout, stderr } = await cli('link', '--map', GENSET_MAP, '--profile', profile);
		expect(code).toBe(1);
		expect(stderr).toBe('error: required channel left unlinked: Fuel level\n');
		expect(JSON.parse(stdout).unlinked.map((u: { wanted: string }) => u.wanted)).toEqual([
			'Fuel level',
			'Engine hours'
		]);
	});

	it('link --synonyms adds a workspace synonym; a bad synonym file is refused', async () => {
		const dir = mkdtempSync(join(tmpdir(), 'fw-syn-'));
		// Invented: this workspace's panels call coolant temperature "wet temp".
		const profile = join(dir, 'p.json');
		writeFileSync(
			profile,
			JSON.stringify({
				format: 'framewright-profile@1',
				name: 'Panel',
				kind: 'display',
				wanted: [{ name: 'Wet temp', quantity: 'temperature', unit: '°C' }]
			})
		);
		const synonyms = join(dir, 's.json');
		writeFileSync(
			synonyms,
			JSON.stringify({ concepts: [{ id: 'coolant-temperature', names: ['wet temp'] }] })
		);
		const plain = JSON.parse((await cli('link', '--map', GENSET_MAP, '--profile', profile)).stdout);
		expect(plain.links).toEqual([]);
		const extended = await cli(
			'link',
			'--map',
			GENSET_MAP,
			'--profile',
			profile,
			'--synonyms',
			synonyms
		);
		expect(extended.code).toBe(0);
		expect(JSON.parse(extended.stdout).links.map((l: { signal: string }) => l.signal)).toEqual([
			'CoolantTemp'
		]);
		const bad = join(dir, 'bad.json');
		writeFileSync(bad, JSON.stringify({ concepts: [{ id: 'Not An Id', names: ['x'] }] }));
		const refused = await cli('link', '--map', GENSET_MAP, '--profile', profile, '--synonyms', bad);
		expect(refused.code).toBe(1);
		expect(refused.stderr).toMatch(
			/is not a valid synonym table: concepts\[0\]\.id: a concept id is lower-case words/
		);
	});

	it('receive-set: framewright-receive@1, J1939 frames matched by PGN, °C → °F composed', async () => {
		const { code, stdout, stderr } = await cli(
			'receive-set',
			'--map',
			GENSET_MAP,
			'--profile',
			GENSET_PROFILE
		);
		expect(stderr).toBe('');
		expect(code).toBe(0);
		const set = JSON.parse(stdout);
		expect(set).toMatchObject({ format: 'framewright-receive@1', bitrate: 250000 });
		const coolant = set.channels.find((c: { name: string }) => c.name === 'Coolant temperature');
		// SAE J1939-71 coolant temperature: 1 °C/bit, −40 °C offset; NIST SP 811: t/°F = 1.8 t/°C + 32.
		expect(coolant).toMatchObject({
			id: '0x18FEEE00',
			extended: true,
			j1939: true,
			startBit: 0,
			length: 8,
			form: 'linear',
			unit: '°F'
		});
		expect(coolant.scale).toBeCloseTo(1.8, 12);
		expect(coolant.offset).toBeCloseTo(-40 * 1.8 + 32, 12);
	});

	// Not concurrent: each case starts a Node process, and the shared table below already runs many at once.
	it.each([
		[
			'link without --profile',
			['link', '--map', CLUB_MAP],
			2,
			/--profile PROFILE.json is required/
		],
		[
			'link a map given as the profile',
			['link', '--map', CLUB_MAP, '--profile', CLUB_MAP],
			1,
			/is not a valid receiver profile: format: must be "framewright-profile@1"/
		],
		[
			'link a hand-made link the map does not have',
			['link', '--map', GENSET_MAP, '--profile', DASH_PROFILE],
			1,
			/manualLinks\[0\]\.frame: map "Generator set engine \(J1939\)" has no frame "Pressures"/
		],
		[
			'receive-set missing profile file',
			['receive-set', '--map', CLUB_MAP, '--profile', 'nope.json'],
			1,
			/nope.json: no such file/
		]
	] as [string, string[], number, RegExp][])(
		'bad input: %s',
		async (_, args, exitCode, message) => {
			const { code, stdout, stderr } = await cli(...args);
			expect(code).toBe(exitCode);
			expect(stderr).toMatch(message);
			expect(stderr.trim().split('\n')).toHaveLength(1); // one-line message
			if (exitCode === 2) expect(stdout).toBe('');
		}
	);
});

describe('cli bad input', () => {
	it.concurrent.each([
		['no command', [], 2, /Usage/],
		['unknown command', ['frobnicate'], 2, /unknown command "frobnicate"/],
		['decode without --map', ['decode', CLUB_CSV], 2, /--map MAP.json is required/],
		['decode without capture', ['decode', '--map', CLUB_MAP], 2, /CAPTURE.csv is required/],
		[
			'decode unknown option',
			['decode', '--mapp', CLUB_MAP, CLUB_CSV],
			2,
			/Unknown option '--mapp'/
		],
		[
			'decode missing capture file',
			['decode', '--map', CLUB_MAP, 'fixtures/nope.csv'],
			1,
			/nope.csv: no such file/
		],
		[
			'decode missing map file',
			['decode', '--map', 'nope.json', CLUB_CSV],
			1,
			/nope.json: no such file/
		],
		[
			'decode a map that is not a map',
			['decode', '--map', CLUB_CSV, CLUB_CSV],
			1,
			/is not a valid map: JSON syntax error/
		],
		[
			'decode a capture that is not a capture',
			['decode', '--map', CLUB_MAP, CLUB_MAP],
			1,
			/Could not recognise|at least a time|no row/i
		],
		['j1939 without ID', ['j1939'], 2, /exactly one ID/],
		['j1939 bare hex', ['j1939', '18FEF100'], 2, /0x prefix/],
		['j1939 ID above 29 bits', ['j1939', '0x20000000'], 2, /above 0x1FFFFFFF/],
		['frame-bits 11-bit ID too big', ['frame-bits', '--id', '0x800', '--data', '00'], 2, /0…0x7FF/],
		[
			'frame-bits nine bytes',
			['frame-bits', '--id', '0x100', '--data', '000000000000000000'],
			2,
			/0–8 data bytes/
		],
		['frame-bits bad hex', ['frame-bits', '--id', '0x100', '--data', 'zz'], 2, /not hex bytes/],
		['frame-bits without --data', ['frame-bits', '--id', '0x100'], 2, /--data is required/],
		['bit-timing without --clock', ['bit-timing', '--bitrate', '500k'], 2, /--clock/],
		[
			'bit-timing sample point as percent',
			['bit-timing', '--clock', '16M', '--bitrate', '500k', '--sample-point', '87.5'],
			2,
			/fraction/
		],
		[
			'bit-timing nonsense bitrate',
			['bit-timing', '--clock', '16M', '--bitrate', 'fast'],
			2,
			/not a number/
		],
		[
			'bus-load bitrate too low',
			['bus-load', '--map', CLUB_MAP, '--bitrate', '10'],
			2,
			/at least 1000/
		],
		[
			'bus-load data bitrate not a number',
			['bus-load', '--map', CLUB_MAP, '--data-bitrate', 'fast'],
			2,
			/--data-bitrate \(bits per second\) "fast" is not a number/
		],
		[
			'bus-load data bitrate too high',
			['bus-load', '--map', CLUB_MAP, '--data-bitrate', '20M'],
			2,
			/--data-bitrate must be at most 16M/
		],
		['lint missing file', ['lint', '--map', 'nope.json'], 1, /nope.json: no such file/]
	] as [string, string[], number, RegExp][])('%s', async (_, args, exitCode, message) => {
		const { code, stdout, stderr } = await cli(...args);
		expect(code).toBe(exitCode);
		expect(stderr).toMatch(message);
		expect(stderr.trim().split('\n').length === 1 || /Usage/.test(stderr)).toBe(true); // one-line message
		if (exitCode === 2) expect(stdout).toBe('');
	});
});
