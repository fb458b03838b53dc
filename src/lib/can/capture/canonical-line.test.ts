import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { linePlan, readPlainLine } from './canonical-line';
import { CANONICAL_LAYOUT, type CaptureLayout } from './layout';
import type { FrameSink } from './frame-store';
import { ingestCaptureInto } from './ingest';
import { createParsedRow, createRowParser, createRowParserState } from './row-parser';

/** Everything an import produces, in comparable form: the report and every frame with its extras. */
async function importBoth(text: string | string[], layout?: CaptureLayout) {
	const routes = await Promise.all(
		[true, false].map(async (canonicalFastPath) => {
			const frames: unknown[] = [];
			const sink: FrameSink = {
				add: (time, id, extended, data, length, extras) =>
					frames.push([time, id, extended, Array.from(data.subarray(0, length)), extras])
			};
			const report = await ingestCaptureInto(text, sink, { canonicalFastPath, layout });
			return { report, frames };
		})
	);
	return { fast: routes[0], general: routes[1] };
}

// The reference for the fast path is the general route (papaparse + the row parser), which the
// ingest tests check against the capture CSV contract in docs/capture-csv.md.
describe('canonical fast path gives exactly what the general route gives', () => {
	const awkward = [
		'time,id,extended,dlc,data',
		'0.000000,100,0,8,11 22 33 44 55 66 77 88',
		'0.001000,7FF,0,2,aBcD', // unspaced, mixed case
		'',
		'0.002000,0x101,0,1,01', // 0x prefix: general route
		'0.003000,18FEF100,1,8,FF FF FF FF FF FF FF FF,bus0', // extra column
		'0.004000,800,0,1,00', // 12-bit ID marked standard: bad row
		'0.005000,100,0,9,00 01 02 03 04 05 06 07 08 09 0a 0b', // CAN FD code 9 = 12 bytes
		'0.006000,100,0,12,00 01 02 03 04 05 06 07 08 09 0a 0b', // byte count
		'0.007000,100,0,3,00 01', // DLC mismatch: bad row
		'0.008000,100,0,3,0 1 2', // one-digit bytes: general route
		'0.009000,100,0,2,11  22', // double space: general route
		'0.0100,100,2,1,00', // bad flag
		' 0.011000,100,0,1,00', // leading blank: general route
		'0.012000,100,0,8', // missing data column
		'0.012500,100,1,0,', // empty payload, extended small ID
		'0.013000,100,0,1,00 ', // trailing blank
		'0.0005,100,0,1,7f' // earlier than the row before
	];

	it.each([
		['LF', awkward.join('\n') + '\n'],
		['CRLF', awkward.join('\r\n') + '\r\n'],
		['no final newline', awkward.join('\n')]
	])('on awkward rows (%s)', async (_name, text) => {
		const { fast, general } = await importBoth(text);
		expect(fast).toEqual(general);
		expect(general.report.badRowCount).toBe(4);
		expect(general.report.frameCount).toBe(awkward.length - 1 - 1 - 4);
	});

	it('on random rows split into uneven chunks, good and bad mixed', async () => {
		const rand = seededRandom(0xfa57);
		const lines = ['time,id,extended,dlc,data'];
		for (let i = 0; i < 3000; i++) {
			const bytes = Array.from(rand.bytes(rand.pick([0, 1, 8, 12])), (b) =>
				b.toString(16).padStart(2, '0')
			);
			const extended = rand.int(0, 1);
			const id = rand.int(0, extended ? 0x1fffffff : 0x7ff).toString(16);
			const line = `${(i / 1000).toFixed(rand.int(0, 7))},${id},${extended},${rand.pick([bytes.length, bytes.length > 8 ? 9 : 3])},${bytes.join(rand.pick([' ', '']))}`;
			lines.push(rand.int(0, 20) === 0 ? line.replace(',', rand.pick([';', ',x', ', '])) : line);
		}
		const text = lines.join('\n') + '\n';
		const chunks: string[] = [];
		for (let at = 0; at < text.length;) {
			const size = rand.int(1, 5000);
			chunks.push(text.slice(at, at + size));
			at += size;
		}
		const { fast, general } = await importBoth(chunks);
		expect(fast).toEqual(general);
		expect(general.report.badRowCount).toBeGreaterThan(0);
		expect(general.report.frameCount).toBeGreaterThan(1500);
	});

	it('reads a line in place between other text', () => {
		const text = 'junk\n1.500000,1a0,0,3,01 02 ff\nmore';
		const out = createParsedRow();
		const start = text.indexOf('\n') + 1;
		const plan = linePlan(CANONICAL_LAYOUT, createRowParserState())!;
		expect(readPlainLine(text, start, text.lastIndexOf('\n'), out, plan)).toBe(true);
		expect([out.time, out.id, out.extended, out.length, ...out.data.subarray(0, 3)]).toEqual([
			1.5,
			0x1a0,
			false,
			3,
			1,
			2,
			255
		]);
	});

	// Other layouts the in-place reader serves: the same equality with the general route.
	it.each([
		[
			'semicolons, h-suffix IDs, spaced bytes',
			[
				'Time;ID;DLC;Data',
				'0.001000;3BAh;8;11 22 33 44 55 66 77 88',
				'0.002000;18FEF100h;2;AA BB', // extended by size
				'0.003000;3bAH;1;0F',
				'0.004000;0x12h;1;00', // prefix and suffix: bad row
				'0.005000;100x;1;00', // marker letter: general route
				'0,006;100h;1;01', // decimal comma: general route
				'0.007000;h;1;00', // no digits: bad row
				'0.008000;100h;3;01 02', // DLC mismatch: bad row
				'0.009000;7FFh;0;'
			]
		],
		[
			'direction column, columns in another order',
			[
				'dir,data,id,time,dlc',
				'Rx,11 22,100,0.001,2',
				'tx,,7FF,0.002,0',
				'TX,01,800,0.003,1', // no flag column: 0x800 is extended
				'out,01,100,0.004,1', // a word: general route
				'Qx,01,100,0.005,1', // bad direction: bad row
				'Rx,01,100', // too few columns: bad row
				'Rx,01 02 03 04 05 06 07 08 09,100,0.006,9' // 9 bytes: bad row
			]
		],
		[
			'time of day passing midnight, bus and direction columns',
			[
				'time,bus,dir,id,dlc,data',
				'23:59:59.900000,can0,Rx,100,1,01',
				'23:59:59.950000,can1,Tx,100,1,02',
				'00:00:00.010000,can0,Rx,100,1,03', // past midnight
				'0:00:00.020000,can1,Rx,100,1,04', // one-digit hour
				'00:00:00.030000, can1,Rx,100,1,05', // blank before the bus: general route
				'00:00:00.040000,can2,Rx,100,3,05', // new bus, DLC mismatch: bad row
				'00:00:00.050000,can2,Rx,100,1,06',
				'25:00:00.000000,can0,Rx,100,1,07', // no such hour: bad row
				'00:00:00.060000,can0,Rx,100,1,08'
			]
		],
		[
			'ISO 8601 date-times',
			[
				'timestamp,id,dlc,data',
				'2026-03-01T10:15:00.000001Z,100,1,01',
				'2026-03-01 10:15:00.5,100,1,02',
				'2026-03-02T00:00:00+01:00,100,1,03', // offset: general route
				'2026-02-30T00:00:00Z,100,1,04', // no such day: bad row
				'2026-03-02T00:00:01.123456789z,100,1,05'
			]
		],
		[
			'ragged byte columns, a flag after the bytes, no header',
			[
				'0.001000,100,8,11,22,33,44,55,66,77,88,S',
				'0.002000,18FE0021,3,A,bb,0C,X', // one-digit byte
				'0.003000,101,0,S', // no bytes: the tag is right after the DLC
				'0.003500,101,0', // no bytes, no tag
				'0.004000,102,2,01,02', // no tag
				'0.004500,102,2,01,02,', // empty tag
				'0.005000,103,1,01,R', // a new tag: general route
				'0.006000,104,0,R', // a remote request by its tag: general route
				'0.007000,105,2,01, S', // blank before the tag: general route
				'0.008000,106,3,01,02,S', // too few bytes ("S" is no hex byte): bad row
				'0.009000,107,3,01,02,E', // too few bytes ("E" is a byte): bad row
				'0.010000,108,2,01,123,S', // three digits: bad row
				'0.011000,109,9,00,01,02,03,04,05,06,07,08,09,0a,0b,S', // more than the 8 columns: bad row
				'0.012000,10A,2,01,02,S,extra', // columns after the tag are ignored
				'0.013000,10B,2,01,02,X'
			],
			// given, as the user confirms it: the detector would not guess from rows this awkward
			{
				...CANONICAL_LAYOUT,
				hasHeader: false,
				extendedColumn: null,
				dlcColumn: 2,
				dataColumn: null,
				byteColumns: [3, 4, 5, 6, 7, 8, 9, 10],
				tagColumn: 'after-bytes'
			} satisfies CaptureLayout
		],
		[
			'ms times, 0x IDs, byte columns with empty ones at the end',
			[
				'time_ms,id,dlc,b0,b1,b2,b3,b4,b5,b6,b7',
				'1.000,0x100,8,11,22,33,44,55,66,77,88',
				'2.000,0x18FE0021,3,11,22,33,,,,,',
				'3.000,0x101,0,,,,,,,,',
				'4.000,0x102,2,11,22',
				'5.000,0x103,3,11,,33,,,,,', // an empty column ends the bytes: bad row
				'6.000,0x104,2,11,22,33,44,,,,', // more bytes than the DLC: they are ignored
				'7.000,0x105,2,11, 22,,,,,,', // blank in a byte: general route
				'8.000,0x106,2,1G,22,,,,,,' // not hex: bad row
			]
		],
		[
			'byte columns after a bus column, a tag in a later column',
			[
				'time;bus;id;dlc;b0;b1;b2;b3;note',
				'0.1;can0;100;2;01;02;;;start',
				'0.2;can0;100;4;01;02;03;04;start',
				'0.3;can1;100;1;01;;;;',
				'0.4;can0;100;1;01', // the line ends before the tag
				'0.5;can0;100;1;01;;;;other', // a new tag: general route
				'0.6;can0;100;1;01;;;;other',
				'0.7;can0;100;1;01;;;;start;more',
				'0.8;can0;100;1;;;;;start' // no byte for the DLC: bad row
			]
		],
		[
			'tabs, extended flag',
			[
				'time\tid\textended\tdlc\tdata',
				'0.1\t0x100\t0\t8\t0102030405060708',
				'0.2\t18DA00F1\t1\t3\t01 02 03',
				'0.3\t800\t0\t1\t00', // 12-bit ID marked standard
				'0.4\tZZZ\t0\t1\t00' // not an ID: bad row
			]
		]
	] as [string, string[], CaptureLayout?][])('on %s', async (_name, lines, layout) => {
		for (const text of [lines.join('\n') + '\n', lines.join('\r\n')]) {
			const { fast, general } = await importBoth(text, layout);
			// The layout is one the in-place reader serves, so the equality says something.
			expect(linePlan(general.report.layout, createRowParserState())).not.toBeNull();
			expect(fast).toEqual(general);
			expect(general.report.frameCount).toBeGreaterThan(1);
			expect(general.report.badRowCount).toBeGreaterThan(0);
		}
	});
});

// Within one chunk a line naming a bus or tag not met yet sends the lines after it the general way
// too, so short files hardly reach the in-place reader: here it meets the names first, line by line.
describe('the in-place reader on byte columns, line by line against the row parser', () => {
	const layout: CaptureLayout = {
		...CANONICAL_LAYOUT,
		delimiter: ';',
		timeFormat: 'number',
		idColumn: 2,
		extendedColumn: null,
		dlcColumn: 3,
		dataColumn: null,
		byteColumns: [4, 5, 6, 7],
		busColumn: 1,
		tagColumn: 8
	};
	const lines = [
		'0.1;can0;100;2;01;02;;;start',
		'0.2;can1;18FE0021;4;01;02;03;04;start',
		'0.3;can1;100;1;f;;;;',
		'0.4;can0;100;1;01',
		'0.5;can0;100;0',
		'0.6;can0;100;1;01;;;;other', // a new tag: general route
		'0.7;can0;100;1;01;;;;start;more',
		'0.8;can0;100;1;;;;;start', // no byte for the DLC: bad row
		'0.9;can0;100;3;01;02;03;04;start' // a byte column beyond the DLC is not read
	];

	it('accepts only lines the row parser reads, with the same values', () => {
		const state = createRowParserState();
		state.buses.push('can0', 'can1');
		state.tags.push('start');
		const plan = linePlan(layout, state)!;
		const parse = createRowParser(layout, state);
		const read: number[] = [];
		lines.forEach((line, n) => {
			const fast = createParsedRow();
			if (!readPlainLine(line, 0, line.length, fast, plan)) return;
			read.push(n);
			const general = createParsedRow();
			expect(parse(Papa.parse<string[]>(line, { delimiter: ';' }).data[0], general)).toBeNull();
			expect(fast).toEqual(general);
		});
		expect(read).toEqual([0, 1, 2, 3, 4, 6, 8]);
	});
});

describe('large chunks read where they lie', () => {
	it('give what small chunks give, with lines and CR LF split between chunks', async () => {
		const rand = seededRandom(0xc4c4);
		const lines = ['time,id,extended,dlc,data'];
		for (let i = 0; i < 8000; i++) {
			const bytes = Array.from(rand.bytes(rand.int(0, 8)), (b) => b.toString(16).padStart(2, '0'));
			lines.push(
				`${(i / 1000).toFixed(6)},${rand.int(0, 0x7ff).toString(16)},0,${bytes.length},${bytes.join(' ')}`
			);
			if (i % 1500 === 7)
				lines.push(['0.5,zz,0,1,00', '"0.6",100,0,1,00', ''][((i - 7) / 1500) % 3]); // bad, quoted, blank
		}
		const text = lines.join('\r\n') + '\r\n';
		const cr = (from: number) => text.indexOf('\r', from) + 1; // a cut between CR and LF
		const cuts = [cr(70_000), 70_000 + 66_000 + 17, cr(210_000)];
		const large = [0, ...cuts, text.length]
			.slice(1)
			.map((end, k, ends) => text.slice(k === 0 ? 0 : ends[k - 1], end));
		expect(large.slice(0, -1).every((chunk) => chunk.length >= 1 << 14)).toBe(true);
		const small = Array.from({ length: Math.ceil(text.length / 997) }, (_, k) =>
			text.slice(k * 997, (k + 1) * 997)
		);
		const inPlace = await importBoth(large);
		const joined = await importBoth(small);
		expect(inPlace.fast).toEqual(joined.fast);
		expect(inPlace.general).toEqual(joined.general);
		expect(inPlace.fast).toEqual(inPlace.general);
		expect(joined.general.report.badRowCount).toBe(2);
		expect(joined.general.report.frameCount).toBeGreaterThan(8000);
	});
});
