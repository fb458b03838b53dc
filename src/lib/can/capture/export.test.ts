// Node-only test for the fixture round trips: it reads the demo files from disk (demo data, used only
// as input to round trips, never as check values).
import { readFile } from 'node:fs/promises';
import { precisionOf } from '../../value-format';
import { describe, expect, it } from 'vitest';
import { readCsvRecords } from '../csv-records';
import { compileMap } from '../decoder';
import { parseMap } from '../map-json';
import { seededRandom } from '../testing/seeded-random';
import { decodeChannels } from './channels';
import {
	canonicalCaptureCsv,
	captureExportFileName,
	csvByteStream,
	longFormCsv,
	MAX_WIDE_ROWS,
	wideFormCsv,
	type ExportChannel
} from './export';
import { FrameStore } from './frame-store';
import { ingestCapture } from './ingest';

const fixture = (name: string) =>
	readFile(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');
const text = (chunks: Iterable<string>) => [...chunks].join('');

function channel(
	frameName: string,
	signalName: string,
	unit: string,
	time: number[],
	value: number[]
): ExportChannel {
	return {
		info: { index: 0, frameIndex: 0, frameName, signalName, unit, min: null, max: null },
		time: Float64Array.from(time),
		value: Float64Array.from(value)
	};
}

function expectSameFrames(a: FrameStore, b: FrameStore) {
	expect(b.count).toBe(a.count);
	expect([...b.time]).toEqual([...a.time]);
	expect([...b.id]).toEqual([...a.id]);
	expect([...b.flags]).toEqual([...a.flags]);
	expect([...b.length]).toEqual([...a.length]);
	expect([...b.data]).toEqual([...a.data]);
}

// ISO 11898-1 CAN FD data length codes: 0–8 bytes are codes 0–8; 12, 16, 20, 24, 32, 48, 64 bytes are 9–15.
const FD_LENGTHS: [number, number][] = [
	[12, 9],
	[16, 10],
	[20, 11],
	[24, 12],
	[32, 13],
	[48, 14],
	[64, 15]
];

describe('canonicalCaptureCsv', () => {
	it('reads back through the importer as the same frames, CAN FD lengths and extended IDs included', async () => {
		const rnd = seededRandom(2024);
		const store = new FrameStore();
		let t = 0;
		const lengths = [0, 1, 2, 3, 4, 5, 6, 7, 8, ...FD_LENGTHS.map(([len]) => len)];
		for (let i = 0; i < 3000; i++) {
			const extended = rnd.next() < 0.4;
			const id = extended ? rnd.int(0, 0x1fffffff) : rnd.int(0, 0x7ff);
			const length = lengths[i % lengths.length];
			store.add(t, id, extended, rnd.bytes(length), length);
			t += rnd.next() * 0.004 + (rnd.next() < 0.01 ? 1e-7 : 0); // irregular gaps, some below a microsecond
		}
		const csv = canonicalCaptureCsv(store);
		// The importer takes the generator's chunks as they come (no whole-file string).
		const back = await ingestCapture(csv);
		expect(back.badRowCount).toBe(0);
		expect(back.layout.timeUnit).toBe('s');
		expectSameFrames(store, back.store);
	});

	it.each(FD_LENGTHS)('writes a %i-byte payload with DLC code %i (ISO 11898-1)', (length, dlc) => {
		const store = new FrameStore();
		store.add(0, 0x18fef100, true, new Uint8Array(length).fill(0xab), length);
		const [header, row] = text(canonicalCaptureCsv(store)).trim().split('\n');
		expect(header).toBe('time,id,extended,dlc,data');
		expect(row).toBe(`0,18FEF100,1,${dlc},${Array(length).fill('AB').join(' ')}`);
	});

	it('round-trips the demo capture unchanged', async () => {
		const first = await ingestCapture(await fixture('club-racer-session.csv'));
		const again = await ingestCapture(canonicalCaptureCsv(first.store));
		expect(again.badRowCount).toBe(0);
		expectSameFrames(first.store, again.store);
	});
});

describe('longFormCsv', () => {
	it('holds every decoded sample at its signal’s precision, in time order across channels', async () => {
		const parsed = parseMap(await fixture('club-racer-ecu.map.json'));
		if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
		const { store } = await ingestCapture(await fixture('club-racer-session.csv'));
		const channels = decodeChannels(store, compileMap(parsed.map));
		const records = readCsvRecords(text(longFormCsv(channels)));
		expect(records[0].fields).toEqual(['time', 'frame', 'signal', 'value', 'unit']);
		const rows = records.slice(1).map((r) => r.fields);
		expect(rows.length).toBe(channels.reduce((sum, c) => sum + c.count, 0));
		for (let j = 1; j < rows.length; j++)
			expect(Number(rows[j][0])).toBeGreaterThanOrEqual(Number(rows[j - 1][0]));

		const byChannel = new Map<string, string[][]>();
		for (const row of rows) {
			const key = `${row[1]}/${row[2]}`;
			if (!byChannel.has(key)) byChannel.set(key, []);
			byChannel.get(key)!.push(row);
		}
		for (const c of channels) {
			const mine = byChannel.get(`${c.info.frameName}/${c.info.signalName}`) ?? [];
			// Printed with the decimals the scale allows: the same number up to the double's own noise,
			// and never the noise itself (at most 15 significant digits).
			mine.forEach((r, j) => {
				expect(Math.abs(Number(r[3]) - c.value[j])).toBeLessThanOrEqual(
					1e-12 * Math.max(1, Math.abs(c.value[j]))
				);
				expect(r[3].replace(/^-|\.|e.*$/g, '').replace(/^0+/, '').length).toBeLessThanOrEqual(15);
			});
			expect(mine.map((r) => Number(r[0]))).toEqual([...c.time]);
			expect(mine.every((r) => r[4] === c.info.unit)).toBe(true);
		}
	});

	it('prints values with the decimals their scale allows, without binary noise', () => {
		const c = channel('Fuel', 'Flow', 'l/s', [0, 0.1], [3524 * 0.000001, 998 * 0.1]);
		c.info.precision = precisionOf({ scale: 0.000001, offset: 0, valueType: 'unsigned' });
		// 3524 × 0.000001 is 0.0035240000000000002 as a double; the 1e-6 scale allows six decimals.
		expect(text(longFormCsv([c]))).toBe(
			'time,frame,signal,value,unit\n0,Fuel,Flow,0.003524,l/s\n0.1,Fuel,Flow,99.800000,l/s\n'
		);
	});

	it('quotes names per RFC 4180 (comma, double quote, line break) and they read back intact', () => {
		const c = channel('Body, rear', 'Say "hi"', 'two\nlines', [0.5], [-1.25]);
		const csv = text(longFormCsv([c]));
		// RFC 4180 §2.6–2.7: fields with commas, quotes or line breaks are enclosed in double quotes;
		// a double quote inside is written twice.
		expect(csv).toBe(
			'time,frame,signal,value,unit\n0.5,"Body, rear","Say ""hi""",-1.25,"two\nlines"\n'
		);
		expect(readCsvRecords(csv)[1].fields).toEqual([
			'0.5',
			'Body, rear',
			'Say "hi"',
			'-1.25',
			'two\nlines'
		]);
	});

	it('streams in bounded chunks instead of one string', () => {
		const n = 50_000;
		const c = channel(
			'F',
			'S',
			'u',
			Array.from({ length: n }, (_, i) => i / 1000),
			Array.from({ length: n }, (_, i) => i * 0.1)
		);
		const chunks = [...longFormCsv([c])];
		expect(chunks.length).toBeGreaterThan(5);
		expect(Math.max(...chunks.map((s) => s.length))).toBeLessThan(70_000);
	});
});

describe('wideFormCsv', () => {
	// Hand-computed example: A samples 1, 2, 3, 4 at 0, 0.25, 0.5, 1 s; B samples 10, 20 at 0.1, 0.6 s.
	const a = channel('Pwr', 'Batt', 'V', [0, 0.25, 0.5, 1], [1, 2, 3, 4]);
	const b = channel('Eng', 'Mode', '', [0.1, 0.6], [10, 20]);

	it('last: the latest sample at or before each row, empty before the first', () => {
		expect(text(wideFormCsv([a, b], { interval: 0.5, mode: 'last' }))).toBe(
			'time,Pwr.Batt [V],Eng.Mode\n0,1,\n0.5,3,10\n1,4,20\n'
		);
	});

	it('mean: the mean of the samples in (row − interval, row], empty when none', () => {
		// 0: A {1} → 1, B {} ; 0.5: A {2, 3} → 2.5, B {10}; 1: A {4}, B {20}
		expect(text(wideFormCsv([a, b], { interval: 0.5, mode: 'mean' }))).toBe(
			'time,Pwr.Batt [V],Eng.Mode\n0,1,\n0.5,2.5,10\n1,4,20\n'
		);
	});

	it('writes row times without binary noise and honours from/to', () => {
		const c = channel('F', 'S', '', [0, 0.3], [5, 6]);
		// 3 × 0.1 is 0.30000000000000004 in binary floating point; the row is written (and compared) as 0.3.
		expect(text(wideFormCsv([c], { interval: 0.1, mode: 'last' }))).toBe(
			'time,F.S\n0,5\n0.1,5\n0.2,5\n0.3,6\n'
		);
		expect(text(wideFormCsv([c], { interval: 0.1, mode: 'last', from: 0.2, to: 0.35 }))).toBe(
			'time,F.S\n0.2,5\n0.3,6\n'
		);
	});

	it('refuses a non-positive interval and an interval that would make too many rows', () => {
		expect(() => text(wideFormCsv([a], { interval: 0, mode: 'last' }))).toThrow(/positive/);
		expect(() => text(wideFormCsv([a], { interval: 1 / MAX_WIDE_ROWS / 2, mode: 'last' }))).toThrow(
			/longer interval/
		);
	});

	it('gives the header alone when no channel has samples', () => {
		expect(text(wideFormCsv([channel('F', 'S', 'V', [], [])], { interval: 1, mode: 'mean' }))).toBe(
			'time,F.S [V]\n'
		);
	});
});

describe('csvByteStream', () => {
	it('carries the chunks as UTF-8 bytes', async () => {
		const c = channel('Öl', 'Druck', 'kPa', [0], [1]);
		const body = await new Response(csvByteStream(longFormCsv([c]))).text();
		expect(body).toBe('time,frame,signal,value,unit\n0,Öl,Druck,1,kPa\n');
	});
});

describe('captureExportFileName', () => {
	it('puts the map and revision into decoded exports’ names', () => {
		expect(
			captureExportFileName('Lap 3 (wet)', 'long', { mapName: 'Engine Map', revision: 'r2' })
		).toBe('lap-3-wet.long.engine-map-r2.csv');
		expect(
			captureExportFileName('Lap 3', 'wide', { mapName: 'Engine Map', revision: 'draft' })
		).toBe('lap-3.wide.engine-map-draft.csv');
		expect(captureExportFileName('../../etc', 'frames')).toBe('etc.frames.csv');
		expect(() => captureExportFileName('Lap 3', 'long')).toThrow(/map and revision/);
	});
});

// Issue 10, finding 5: channel names and units come from maps anyone in a workspace can edit. Per
// OWASP's "CSV Injection" guidance (owasp.org/www-community/attacks/CSV_Injection) a text cell
// starting with = + - @, tab or carriage return gets a leading single quote; numbers stay numbers.
// Read back with papaparse, an independent CSV reader, as a spreadsheet would split the file.
describe('capture exports neutralise formula text', () => {
	const hostile = [
		channel(
			"+cmd|' /C calc'!A0",
			'=HYPERLINK("http://evil.example","x")',
			'-2+3',
			[0, 1],
			[-40, 2.5]
		),
		channel('@SUM(1)', '\t=1', 'kPa', [0.5], [-1])
	];

	it('long form: frame, signal and unit cells are quoted text; times and values are numbers', async () => {
		const { default: Papa } = await import('papaparse');
		const rows = Papa.parse<string[]>(text(longFormCsv(hostile)).trim(), { delimiter: ',' }).data;
		expect(rows.slice(1)).toEqual([
			['0', `'+cmd|' /C calc'!A0`, `'=HYPERLINK("http://evil.example","x")`, '-40', `'-2+3`],
			['0.5', `'@SUM(1)`, `'\t=1`, '-1', 'kPa'],
			['1', `'+cmd|' /C calc'!A0`, `'=HYPERLINK("http://evil.example","x")`, '2.5', `'-2+3`]
		]);
	});

	it('wide form: the column names are quoted text', async () => {
		const { default: Papa } = await import('papaparse');
		const rows = Papa.parse<string[]>(
			text(wideFormCsv(hostile, { interval: 1, mode: 'last' })).trim(),
			{
				delimiter: ','
			}
		).data;
		expect(rows[0]).toEqual([
			'time',
			`'+cmd|' /C calc'!A0.=HYPERLINK("http://evil.example","x") [-2+3]`,
			`'@SUM(1).\t=1 [kPa]`
		]);
		expect(rows[1]).toEqual(['0', '-40', '']);
	});
});
