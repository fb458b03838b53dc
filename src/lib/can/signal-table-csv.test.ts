import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { canMapSchema, type CanMap } from './map';
import { parseMap } from './map-json';
import {
	parseSignalTable,
	SIGNAL_TABLE_COLUMNS,
	signalTableTemplate,
	writeSignalTable
} from './signal-table-csv';
import { seededRandom } from './testing/seeded-random';

function fixture(file: string): CanMap {
	const parsed = parseMap(
		readFileSync(new URL(`../../../fixtures/${file}`, import.meta.url), 'utf8')
	);
	if (!parsed.ok) throw new Error(`${file} does not parse`);
	return parsed.map;
}

function roundTrip(map: CanMap) {
	return parseSignalTable(writeSignalTable(map), { name: map.name, bitrate: map.bitrate });
}

const HEADER = SIGNAL_TABLE_COLUMNS.map((c) => c.name).join(',');

describe('the CSV signal table round trip', () => {
	it.each(['club-racer-ecu.map.json', 'genset-j1939.map.json'])(
		'%s comes back unchanged but for its alert rules',
		(file) => {
			const map = fixture(file);
			// The table carries frames and signals only; alert rules travel in the JSON format.
			expect(roundTrip(map)).toEqual({ ok: true, map: { ...map, alertRules: [] } });
		}
	);

	it('keeps signal roles (a counter and a checksum beside a value)', () => {
		const map = canMapSchema.parse({
			format: 'framewright-map@1',
			name: 'Roles',
			frames: [
				{
					name: 'Status',
					id: '0x3A1',
					signals: [
						{ name: 'Speed', startBit: 8, length: 16 },
						{ name: 'Alive', startBit: 48, length: 4, role: 'counter' },
						{ name: 'Crc', startBit: 56, length: 8, role: 'checksum' }
					]
				}
			]
		});
		const back = roundTrip(map);
		expect(back).toEqual({ ok: true, map });
		expect(back.ok && back.map.frames[0].signals.map((s) => s.role)).toEqual([
			'value',
			'counter',
			'checksum'
		]);
	});

	it('keeps awkward text, labels, FD lengths, extended IDs and frames without signals', () => {
		const map = canMapSchema.parse({
			format: 'framewright-map@1',
			name: 'Awkward',
			bitrate: 1_000_000,
			frames: [
				{ name: 'Empty', id: '0x7FF', length: 0, signals: [] },
				{
					name: 'Wide, "quoted"',
					id: '0x1ABCDEF0',
					extended: true,
					length: 64,
					cycleMs: 12.5,
					sender: 'Body; rear',
					j1939: true,
					comment: 'two\nlines',
					signals: [
						{
							name: 'Mode',
							startBit: 0,
							length: 4,
							multiplexer: true,
							labels: { '-1': 'Minus; one', '0': 'a=b', '3': 'back\\slash', '4': ' spaced ' }
						},
						{
							name: 'Tiny',
							startBit: 500,
							length: 12,
							byteOrder: 'big',
							valueType: 'signed',
							scale: 1e-7,
							offset: -0.1,
							min: -0.3,
							max: 0.3,
							muxValue: 2,
							spn: 524287,
							unit: '°C',
							comment: ' padded '
						},
						{ name: 'Real', startBit: 64, length: 64, valueType: 'float64', scale: 0.1 }
					]
				}
			]
		});
		expect(roundTrip(map)).toEqual({ ok: true, map });
	});

	it('round-trips 200 seeded random maps', () => {
		const rnd = seededRandom(4180);
		for (let n = 0; n < 200; n++) {
			const map = canMapSchema.parse({
				format: 'framewright-map@1',
				name: `Random ${n}`,
				frames: Array.from({ length: rnd.int(0, 4) }, (_, f) => {
					const extended = rnd.next() < 0.5;
					return {
						name: `F${f}`,
						id: f * 0x101 + (extended ? 0x800 : 0),
						extended,
						length: rnd.pick([0, 1, 8, 12, 64]),
						cycleMs: rnd.next() < 0.3 ? null : rnd.int(1, 1000),
						signals: Array.from({ length: rnd.int(0, 3) }, (_, s) => ({
							name: `S${s}`,
							startBit: rnd.int(0, 511),
							length: rnd.int(1, 64),
							byteOrder: rnd.pick(['little', 'big'] as const),
							scale: rnd.next() * 10 - 5,
							offset: rnd.int(-1000, 1000) / 7,
							min: rnd.next() < 0.5 ? null : -rnd.next(),
							labels: rnd.next() < 0.3 ? { [String(rnd.int(-5, 5))]: `L;${rnd.int(0, 9)}=` } : {}
						}))
					};
				})
			});
			expect(roundTrip(map)).toEqual({ ok: true, map });
		}
	});

	it('the template is a valid table with the documented header', () => {
		const text = signalTableTemplate();
		expect(text.split('\r\n')[0]).toBe(HEADER);
		const parsed = parseSignalTable(text);
		expect(parsed.ok && parsed.map.frames[0].signals.map((s) => s.name)).toEqual([
			'EngineSpeed',
			'CoolantTemp',
			'FanState'
		]);
	});
});

describe('reading a hand-written table', () => {
	it('needs only the required columns; blank frame cells repeat the row above; IDs above 0x7FF are extended', () => {
		const text = [
			'frame_name,frame_id,signal_name,start_bit,bit_length,labels',
			'Engine,0x100,Speed,0,16,',
			',0x100,Gear,16,4,0=N;1=First',
			'Truck,0x18FEF100,,,,'
		].join('\n');
		const parsed = parseSignalTable(text, { name: 'Hand' });
		expect(parsed.ok).toBe(true);
		if (!parsed.ok) return;
		expect(parsed.map.frames.map((f) => [f.name, f.id, f.extended, f.signals.length])).toEqual([
			['Engine', 0x100, false, 2],
			['Truck', 0x18fef100, true, 0]
		]);
		expect(parsed.map.frames[0].signals[1].labels).toEqual({ '0': 'N', '1': 'First' });
	});

	it('reports every problem with its line and column, not just the first', () => {
		const text = [
			'frame_name,frame_id,signal_name,start_bit,bit_length,byte_order,labels,cycle_ms',
			'Engine,0x100,Speed,0,16,little,,10',
			'Engine,0x100,Temp,16,99,middle,,10', // bit_length out of range, byte_order unknown
			'Engine,0x100,Fan,24,2,little,0:Off,20', // label syntax; cycle time disagrees with line 2
			'Engine,0x100,,,,,,', // frame-only row: fine
			'Other,0x200,,30,8,little,,', // signal columns without a name
			'Short,0x300,X,0' // wrong field count
		].join('\n');
		const parsed = parseSignalTable(text);
		expect(parsed.ok).toBe(false);
		if (parsed.ok) return;
		expect(parsed.problems.map((p) => [p.line, p.column])).toEqual([
			[3, 'bit_length'],
			[3, 'byte_order'],
			[4, 'labels'],
			[6, 'signal_name'],
			[7, undefined]
		]);
		// The cycle-time conflict is found once the label problem on that row is fixed.
		const fixed = parseSignalTable(text.replace('0:Off', '0=Off'));
		expect(!fixed.ok && fixed.problems.find((p) => p.line === 4)).toMatchObject({
			column: 'cycle_ms',
			message: expect.stringContaining('line 2')
		});
	});

	it('refuses a header with unknown, duplicate or missing columns', () => {
		const parsed = parseSignalTable(
			'frame_name,frame_id,signal_name,start_bit,colour,frame_id\nA,1,S,0,red,1'
		);
		expect(!parsed.ok && parsed.problems.map((p) => [p.line, p.column])).toEqual([
			[1, 'colour'],
			[1, 'frame_id'],
			[1, 'bit_length']
		]);
		expect(parseSignalTable('')).toMatchObject({ ok: false, problems: [{ line: 1 }] });
	});
});
