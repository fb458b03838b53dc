/**
 * The notations real recordings use: ID and time notations, tag, bus, direction and frame-kind
 * columns, rows of varying width, and files whose columns the importer cannot guess.
 * Payload checks read the same bytes back with DataView from a buffer built from the hex text in the
 * test (the WHATWG/ECMAScript DataView is the reference reader); times against Date.UTC.
 */
import { describe, expect, it } from 'vitest';
import { seededRandom } from '../testing/seeded-random';
import { detectCaptureLayout } from './detect-layout';
import { ingestCapture } from './ingest';
import { CANONICAL_LAYOUT, captureLayoutSchema, unusedColumns } from './layout';
import {
	createRowParserState,
	idNotationOf,
	MAX_BUSES,
	parseDateTime,
	parseDirection,
	parseId,
	parseIdInto,
	parseKind,
	parseTimeOfDay,
	ROW_KIND
} from './row-parser';

const framesOf = async (csv: string) => {
	const result = await ingestCapture(csv);
	const { store } = result;
	const list = Array.from({ length: store.count }, (_, i) => ({
		time: store.time[i],
		id: store.id[i],
		extended: store.isExtended(i),
		data: Array.from(store.payload(i))
	}));
	return { ...result, list };
};

/** The payload as DataView reads it from bytes given as hex pairs. */
const bytesViaDataView = (hex: string) => {
	const pairs = hex.match(/[0-9a-f]{2}/gi) ?? [];
	const view = new DataView(new Uint8Array(pairs.map((p) => parseInt(p, 16))).buffer);
	return Array.from({ length: view.byteLength }, (_, i) => view.getUint8(i));
};

describe('ID notations', () => {
	it.each([
		['0x3BA', 0x3ba],
		['0X3ba', 0x3ba],
		['3BAh', 0x3ba],
		['3bAH', 0x3ba],
		['3BA', 0x3ba],
		['18FEF100h', 0x18fef100]
	])('hex %s reads as %i', (text, value) => {
		expect(parseId(text, 'hex')).toBe(value);
	});

	it('reads decimal IDs and refuses letters in them', () => {
		expect(parseId('954', 'decimal')).toBe(954);
		expect(parseId('95A', 'decimal')).toBe(-1);
	});

	it('takes a trailing x as the extended marker, in hex and decimal', () => {
		const out = { id: 0, marked: false };
		expect(parseIdInto('100x', 'hex', out)).toBe(true);
		expect(out).toEqual({ id: 0x100, marked: true });
		expect(parseIdInto('18FEF100X', 'hex', out)).toBe(true);
		expect(out).toEqual({ id: 0x18fef100, marked: true });
		expect(parseIdInto('256x', 'decimal', out)).toBe(true);
		expect(out).toEqual({ id: 256, marked: true });
		// 0x alone is no ID, and a prefix with a marker still reads.
		expect(parseIdInto('0x', 'hex', out)).toBe(false);
		expect(parseIdInto('0x7FFx', 'hex', out)).toBe(true);
		expect(out).toEqual({ id: 0x7ff, marked: true });
	});

	it('refuses malformed IDs', () => {
		for (const bad of ['', 'h', 'G12', '123456789', '12 34', '0xh', 'x'])
			expect(parseId(bad, 'hex'), bad).toBe(-1);
	});

	it('names the notation it sees', () => {
		expect(idNotationOf('0x3BA')).toBe('hex with a 0x prefix');
		expect(idNotationOf('3BAh')).toBe('hex with an h suffix');
		expect(idNotationOf('3BA')).toBe('hex without prefix or suffix');
		expect(idNotationOf('954')).toBe('digits only (hex or decimal)');
		expect(idNotationOf('18FEF100x')).toBe(
			'hex without prefix or suffix, extended marked by a trailing x'
		);
		expect(idNotationOf('speed')).toBeNull();
	});
});

describe('time notations', () => {
	it('reads a time of day in seconds since midnight', () => {
		expect(parseTimeOfDay('00:00:00')).toBe(0);
		expect(parseTimeOfDay('13:45:30.25')).toBe(13 * 3600 + 45 * 60 + 30.25);
		expect(parseTimeOfDay('9:05:01.000123')).toBeCloseTo(9 * 3600 + 5 * 60 + 1.000123, 9);
		expect(parseTimeOfDay('23:59:59,5')).toBe(86399.5);
		for (const bad of ['25:00:00', '12:60:00', '12:00', '12:00:00.', 'noon'])
			expect(parseTimeOfDay(bad), bad).toBeNaN();
	});

	it('reads ISO 8601 date-times as seconds since 1970 UTC, against Date.UTC', () => {
		// Reference: ECMAScript Date.UTC for the whole seconds.
		expect(parseDateTime('2026-03-14T09:26:53Z')).toBe(Date.UTC(2026, 2, 14, 9, 26, 53) / 1000);
		expect(parseDateTime('2026-03-14 09:26:53')).toBe(Date.UTC(2026, 2, 14, 9, 26, 53) / 1000);
		// An offset of +02:00 is two hours ahead of UTC (ISO 8601:2004, 4.2.5.1; clause number from memory).
		expect(parseDateTime('2026-03-14T11:26:53+02:00')).toBe(
			Date.UTC(2026, 2, 14, 9, 26, 53) / 1000
		);
		expect(parseDateTime('2026-03-14T04:26:53-0500')).toBe(Date.UTC(2026, 2, 14, 9, 26, 53) / 1000);
		// Microseconds survive, which Date (milliseconds) would drop.
		const t = parseDateTime('2026-03-14T09:26:53.589793Z');
		expect(t - Date.UTC(2026, 2, 14, 9, 26, 53) / 1000).toBeCloseTo(0.589793, 6);
		for (const bad of ['2026-02-30T00:00:00Z', '2026-13-01T00:00:00Z', '2026-03-14', 'soon'])
			expect(parseDateTime(bad), bad).toBeNaN();
	});

	it('reads clock times exactly like Date.UTC plus the fraction as Number() reads it (fast path)', () => {
		// References: ECMAScript Date.UTC for the whole seconds and Number() for the decimal fraction,
		// both correctly rounded, summed in the same order. Seeded random dates and clocks.
		const rand = seededRandom(0x7e11);
		for (let k = 0; k < 2000; k++) {
			const [y, mo, d] = [rand.int(1970, 2099), rand.int(1, 12), rand.int(1, 28)];
			const [h, mi, se] = [rand.int(0, 23), rand.int(0, 59), rand.int(0, 59)];
			const digits = rand.int(0, 9);
			const fraction = Array.from({ length: digits }, () => rand.int(0, 9)).join('');
			const two = (n: number) => String(n).padStart(2, '0');
			const clock = `${two(h)}:${two(mi)}:${two(se)}${digits ? `.${fraction}` : ''}`;
			const part = digits ? Number(`0.${fraction}`) : 0;
			const text = `${y}-${two(mo)}-${two(d)}${k % 2 ? 'T' : ' '}${clock}${k % 3 ? 'Z' : ''}`;
			expect(parseDateTime(text), text).toBe(Date.UTC(y, mo - 1, d, h, mi, se) / 1000 + part);
			expect(parseTimeOfDay(clock), clock).toBe(h * 3600 + mi * 60 + se + part);
		}
		// Shapes off the fast path still read (a one-digit hour, an offset, a decimal comma).
		expect(parseTimeOfDay('7:00:00,5')).toBe(7 * 3600 + 0.5);
		expect(parseDateTime('2026-03-14T09:26:53.5+01:00')).toBe(
			Date.UTC(2026, 2, 14, 8, 26, 53) / 1000 + 0.5
		);
	});

	it('reads nanoseconds since the start', async () => {
		const { list, layout } = await framesOf(
			'time_ns,id,dlc,data\n0,100,1,01\n1500000,100,1,02\n3000000,100,1,03\n'
		);
		expect(layout.timeUnit).toBe('ns');
		expect(list.map((f) => f.time)).toEqual([0, 0.0015, 0.003]);
	});

	it('crosses midnight in a time-of-day capture and says so', async () => {
		const { list, layout, midnightCrossings, warnings } = await framesOf(
			'23:59:59.990,100,1,01\n23:59:59.995,100,1,02\n00:00:00.000,100,1,03\n00:00:00.005,100,1,04\n'
		);
		expect(layout.timeFormat).toBe('time-of-day');
		expect(layout.hasHeader).toBe(false);
		expect(midnightCrossings).toBe(1);
		expect(list.map((f) => Math.round(f.time * 1e6))).toEqual([0, 5000, 10000, 15000]);
		expect(warnings.join(' ')).toMatch(/passes midnight 1 time/);
	});

	it('keeps a time of day that goes back a little as a backwards row, not a new day', async () => {
		const { list, backwardsTimeCount, midnightCrossings, badRowCount } = await framesOf(
			'10:00:00.100,100,1,01\n10:00:00.050,100,1,02\n10:00:00.200,100,1,03\n'
		);
		expect(badRowCount).toBe(0);
		expect(midnightCrossings).toBe(0);
		expect(backwardsTimeCount).toBe(1);
		expect(list).toHaveLength(3);
	});

	it('gives clock readings their written differences, without the subtraction’s rounding', async () => {
		// Reference: decimal arithmetic on the written readings (.340 − .250 = .090, 01.000 − 00.250 =
		// .750), the value a person reads off the file.
		const ofDay = await framesOf(
			'12:00:00.250,100,1,01\n12:00:00.340,100,1,02\n12:00:01.000,100,1,03\n'
		);
		expect(ofDay.list.map((f) => f.time)).toEqual([0, 0.09, 0.75]);
		const dated = await framesOf(
			'time;id;data\n2026-03-14T09:26:53.250000Z;100;01\n2026-03-14T09:26:53.340001Z;100;02\n'
		);
		expect(dated.list.map((f) => f.time)).toEqual([0, 0.090001]);
	});

	it('reads ISO date-times as wall-clock times', async () => {
		const { list, layout, timeOrigin } = await framesOf(
			'time;id;data\n2026-03-14T09:26:53.500000Z;100;01\n2026-03-14T09:26:53.750000Z;100;02\n'
		);
		expect(layout.timeFormat).toBe('date-time');
		expect(layout.epochTime).toBe(true);
		expect(timeOrigin).toBeCloseTo(Date.UTC(2026, 2, 14, 9, 26, 53, 500) / 1000, 6);
		expect(list.map((f) => f.time)).toEqual([0, 0.25]);
	});
});

describe('awkward files', () => {
	it('reads a semicolon file with h-suffix IDs and space-separated bytes (no longer refused)', async () => {
		const csv =
			'Time;Identifier;Length;Data\n' +
			'0,000;3BAh;8;11 22 33 44 55 66 77 88\n' +
			'0,010;18FEF100h;3;0A 0B 0C\n' +
			'0,020;7FFh;0;\n';
		const { list, badRowCount, layoutNotes } = await framesOf(csv);
		expect(badRowCount).toBe(0);
		expect(list).toEqual([
			{ time: 0, id: 0x3ba, extended: false, data: bytesViaDataView('1122334455667788') },
			{ time: 0.01, id: 0x18fef100, extended: true, data: bytesViaDataView('0A0B0C') },
			{ time: 0.02, id: 0x7ff, extended: false, data: [] }
		]);
		expect(layoutNotes.join(' ')).toMatch(/hex with an h suffix/);
	});

	it('keeps the flag after a ragged row’s bytes as a tag, not as byte 8', async () => {
		const csv =
			'0.000,360,8,01,02,03,04,05,06,07,08,Rx\n' +
			'0.001,361,2,AA,BB,Rx\n' +
			'0.002,362,0,Tx\n' +
			'0.003,363,3,0C,0D,0E\n';
		const { list, layout, badRowCount, tags } = await framesOf(csv);
		expect(badRowCount).toBe(0);
		expect(layout.tagColumn).toBe('after-bytes');
		expect(layout.byteColumns).toHaveLength(8);
		expect(tags).toEqual(['Rx', 'Tx']);
		expect(list.map((f) => f.data)).toEqual([
			bytesViaDataView('0102030405060708'),
			bytesViaDataView('AABB'),
			[],
			bytesViaDataView('0C0D0E')
		]);
	});

	it('finds bus, direction and frame-kind columns by name; remote and error rows are listed, not bad', async () => {
		const csv =
			'time,bus,dir,type,id,dlc,data\n' +
			'0.000,chassis,Rx,,100,2,0102\n' +
			'0.001,powertrain,Tx,data,200,1,03\n' +
			'0.002,chassis,Rx,RTR,300,8,\n' +
			'0.003,powertrain,Rx,error,,,\n' +
			'0.004,chassis,Rx,,100,2,0405\n';
		const result = await framesOf(csv);
		expect(result.layout).toMatchObject({ busColumn: 1, directionColumn: 2, kindColumn: 3 });
		expect(result.badRowCount).toBe(0);
		expect(result.frameCount).toBe(3);
		expect(result.remoteFrameCount).toBe(1);
		expect(result.errorFrameCount).toBe(1);
		expect(result.specialRows).toEqual([
			{ line: 4, kind: 'remote' },
			{ line: 5, kind: 'error' }
		]);
		expect(result.buses).toEqual(['chassis', 'powertrain']);
	});

	it('takes an ID field that says ErrorFrame as an error frame without a kind column', async () => {
		const { errorFrameCount, badRowCount, frameCount } = await framesOf(
			'time,id,dlc,data\n0.0,100,1,01\n0.1,ErrorFrame,,\n0.2,100,1,02\n'
		);
		expect({ errorFrameCount, badRowCount, frameCount }).toEqual({
			errorFrameCount: 1,
			badRowCount: 0,
			frameCount: 2
		});
	});

	it('refuses the 257th bus by line, keeping every row of the first 256', async () => {
		const rows = Array.from({ length: 300 }, (_, k) => `${k / 1000},bus${k},100,1,01`);
		const result = await framesOf(`time,bus,id,dlc,data\n${rows.join('\n')}\n`);
		expect(result.frameCount).toBe(MAX_BUSES);
		expect(result.badRowCount).toBe(300 - MAX_BUSES);
		expect(result.badRows[0].line).toBe(MAX_BUSES + 2);
		expect(result.badRows[0].reason).toMatch(/at most 256 buses/);
	});

	it('reads mixed ID notations in one file and reports a row it cannot read by line', async () => {
		const { list, badRows } = await framesOf(
			'time,id,dlc,data\n0.0,0x100,1,01\n0.1,100h,1,02\n0.2,100,1,03\n0.3,1O0,1,04\n'
		);
		expect(list.map((f) => f.id)).toEqual([0x100, 0x100, 0x100]);
		expect(badRows).toEqual([{ line: 5, reason: 'ID "1O0" is not a hex number' }]);
	});

	it('does not dead-end on a text file it cannot read: a starting layout and the reason', () => {
		const guess = detectCaptureLayout('when,what\nmorning,started\nnoon,stopped\n');
		expect(guess.problem).toMatch(/Could not recognise the capture's columns/);
		expect(guess.notes.join(' ')).toMatch(/The file is kept/);
		expect(captureLayoutSchema.safeParse(guess.layout).success).toBe(true);
	});

	it('still refuses an empty file outright', () => {
		expect(() => detectCaptureLayout('\n\n')).toThrow(/empty/);
	});
});

describe('layout schema and column roles', () => {
	it('reads a layout stored before the new roles existed', () => {
		const { timeFormat, tagColumn, busColumn, directionColumn, kindColumn, ...old } =
			CANONICAL_LAYOUT;
		expect({ timeFormat, tagColumn, busColumn, directionColumn, kindColumn }).toEqual({
			timeFormat: 'number',
			tagColumn: null,
			busColumn: null,
			directionColumn: null,
			kindColumn: null
		});
		expect(captureLayoutSchema.parse(old)).toEqual(CANONICAL_LAYOUT);
	});

	it('lists the columns given no role as ignored', () => {
		expect(unusedColumns({ ...CANONICAL_LAYOUT, tagColumn: 6 }, 8)).toEqual([5, 7]);
	});

	it('reads kind and direction words', () => {
		expect(['', 'data', 'RTR', 'remote', 'Error'].map(parseKind)).toEqual([
			ROW_KIND.data,
			ROW_KIND.data,
			ROW_KIND.remote,
			ROW_KIND.remote,
			ROW_KIND.error
		]);
		expect(parseKind('maybe')).toBeUndefined();
		expect(['Rx', 'tx', 'receive', 'sent', ''].map(parseDirection)).toEqual([0, 1, 0, 1, 0]);
		expect(parseDirection('sideways')).toBeUndefined();
		expect(createRowParserState()).toEqual({
			buses: [],
			tags: [],
			midnightCrossings: 0,
			previousTimeOfDay: -1,
			dayOffset: 0
		});
	});
});
