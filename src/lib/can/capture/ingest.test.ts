import { describe, expect, it } from 'vitest';
import { CaptureFormatError } from './detect-layout';
import { ingestCapture, MAX_REPORTED_BAD_ROWS } from './ingest';
import { CANONICAL_LAYOUT, type CaptureLayout } from './layout';

// Expected values below are hand-computed from the CSV text and the capture format in
// docs/capture-csv.md; DLC lengths follow the ISO 11898-1 CAN FD table (from memory).

const frames = async (csv: string, layout?: CaptureLayout) => {
	const result = await ingestCapture(csv, { layout });
	const { store } = result;
	const list = Array.from({ length: store.count }, (_, i) => ({
		time: store.time[i],
		id: store.id[i],
		extended: store.isExtended(i),
		data: Array.from(store.payload(i))
	}));
	return { ...result, list };
};

describe('capture ingest: layout variants', () => {
	it('reads the canonical layout, spaced and unspaced hex', async () => {
		const { list, layout, badRowCount } = await frames(
			'time,id,extended,dlc,data\n' +
				'0.000000,360,0,8,01 02 03 04 05 06 07 08\n' +
				'0.010000,18FEF100,1,3,0A0B0C\n' +
				'0.020000,7FF,0,0,\n'
		);
		expect(badRowCount).toBe(0);
		expect(layout).toEqual(CANONICAL_LAYOUT);
		expect(list).toEqual([
			{ time: 0, id: 0x360, extended: false, data: [1, 2, 3, 4, 5, 6, 7, 8] },
			{ time: 0.01, id: 0x18fef100, extended: true, data: [10, 11, 12] },
			{ time: 0.02, id: 0x7ff, extended: false, data: [] }
		]);
	});

	it('reads separate byte columns, taking as many as the DLC says', async () => {
		const { list, layout } = await frames(
			'Time,ID,DLC,D0,D1,D2,D3,D4,D5,D6,D7\n' +
				'0.5,100,2,AA,BB,,,,,,\n' +
				'0.6,101,8,00,11,22,33,44,55,66,77\n'
		);
		expect(layout.byteColumns).toEqual([3, 4, 5, 6, 7, 8, 9, 10]);
		expect(layout.dataColumn).toBeNull();
		expect(list.map((f) => f.data)).toEqual([
			[0xaa, 0xbb],
			[0x00, 0x11, 0x22, 0x33, 0x44, 0x55, 0x66, 0x77]
		]);
		expect(list[1].time).toBeCloseTo(0.1, 12); // relative to the first frame at 0.5 s
	});

	it('reads millisecond timestamps named in the header', async () => {
		const { list, layout } = await frames(
			'time_ms,id,dlc,data\n0,100,1,01\n12.5,100,1,02\n1000,100,1,03\n'
		);
		expect(layout.timeUnit).toBe('ms');
		expect(list.map((f) => f.time)).toEqual([0, 0.0125, 1]);
	});

	it('reads microsecond timestamps named in the header', async () => {
		const { list, layout } = await frames('timestamp_us,id,dlc,data\n100,100,1,01\n350,100,1,02\n');
		expect(layout.timeUnit).toBe('us');
		expect(list[1].time).toBeCloseTo(250e-6, 15);
	});

	it('guesses microseconds from whole-number gaps without a header', async () => {
		// Gaps of 230 whole units: far below the ~44 µs minimum frame (ISO 11898-1, 44 bits at
		// 1 Mbit/s, from memory) if they were nanoseconds-scale, and too busy for milliseconds.
		const rows = Array.from(
			{ length: 10 },
			(_, i) => `${1000 + 230 * i},${(0x100 + i).toString(16)},0,1,0${i}`
		);
		const { layout, list, layoutNotes } = await frames(rows.join('\n'));
		expect(layout.hasHeader).toBe(false);
		expect(layout.timeUnit).toBe('us');
		expect(layoutNotes.join(' ')).toMatch(/microseconds — judged by whole numbers about 230 apart/);
		expect(list[9].time).toBeCloseTo(9 * 230e-6, 15);
	});

	it('guesses milliseconds from small whole-number gaps', async () => {
		const rows = Array.from({ length: 10 }, (_, i) => `${5 + i},100,0,1,00`);
		const { layout } = await frames(rows.join('\n'));
		expect(layout.timeUnit).toBe('ms');
	});

	it.each([
		['seconds with decimals', '1718000000.250000', '1718000000.260000', 's', 1718000000.25],
		['milliseconds', '1718000000250', '1718000000260', 'ms', 1718000000.25],
		['microseconds', '1718000000250000', '1718000000260000', 'us', 1718000000.25]
	])(
		'turns absolute epoch %s into times relative to the first frame',
		async (_, t0, t1, unit, origin) => {
			const { list, layout, timeOrigin, store } = await frames(
				`${t0},100,0,1,01\n${t1},100,0,1,02\n`
			);
			expect(layout.epochTime).toBe(true);
			expect(layout.timeUnit).toBe(unit);
			expect(timeOrigin).toBeCloseTo(origin, 5);
			expect(store.origin.epoch).toBe(true);
			expect(list[0].time).toBe(0);
			// A double near 1.7e9 s resolves about 0.24 µs (IEEE 754 binary64: 52-bit fraction), so 1e-6 is the honest tolerance.
			expect(list[1].time).toBeCloseTo(0.01, 6);
		}
	);

	it('accepts 0x prefixes on IDs', async () => {
		const { list } = await frames(
			'time,id,extended,dlc,data\n0,0x1A0,0,1,FF\n0.1,0X18DAF110,1,1,00\n'
		);
		expect(list.map((f) => f.id)).toEqual([0x1a0, 0x18daf110]);
	});

	it('infers the extended flag when the column is missing (ID > 0x7FF ⇒ extended)', async () => {
		const { list, layout } = await frames(
			'time,id,dlc,data\n0,7FF,1,01\n0.1,800,1,02\n0.2,1FFFFFFF,1,03\n'
		);
		expect(layout.extendedColumn).toBeNull();
		expect(list.map((f) => f.extended)).toEqual([false, true, true]);
	});

	it.each([
		['semicolon', ';'],
		['tab', '\t']
	])('detects a %s delimiter', async (_, d) => {
		const csv =
			['time', 'id', 'extended', 'dlc', 'data'].join(d) +
			'\n' +
			['0.1', '123', '0', '2', '12 34'].join(d) +
			'\n';
		const { list, layout } = await frames(csv);
		expect(layout.delimiter).toBe(d);
		expect(list).toEqual([{ time: 0, id: 0x123, extended: false, data: [0x12, 0x34] }]);
	});

	it('reads decimal-comma times in semicolon files', async () => {
		const { list, layout } = await frames('time;id;dlc;data\n0,5;100;1;01\n0,75;100;1;02\n');
		expect(layout.delimiter).toBe(';');
		expect(list[1].time).toBeCloseTo(0.25, 12);
	});

	// ISO 11898-1 CAN FD data length codes (from memory): 9→12, 10→16, 11→20, 12→24, 13→32, 14→48, 15→64 bytes.
	it.each([
		[9, 12],
		[10, 16],
		[11, 20],
		[12, 24],
		[13, 32],
		[14, 48],
		[15, 64]
	])('reads CAN FD DLC %i as %i bytes', async (dlc, bytes) => {
		const hex = Array.from({ length: bytes }, (_, i) =>
			(i & 0xff).toString(16).padStart(2, '0')
		).join('');
		const { list, badRows, store } = await frames(
			`time,id,extended,dlc,data\n0,100,0,${dlc},${hex}\n`
		);
		expect(badRows).toEqual([]);
		expect(list[0].data).toHaveLength(bytes);
		expect(store.flags[0] & 2).toBe(2); // FD flag: payload longer than 8 bytes
	});

	it('accepts a byte count in the DLC column too', async () => {
		const hex = '00'.repeat(12);
		const { list } = await frames(`time,id,extended,dlc,data\n0,100,0,12,${hex}\n`);
		expect(list[0].data).toHaveLength(12);
	});

	it('reads Windows line endings and a byte-order mark', async () => {
		const { list } = await frames(
			'\ufefftime,id,extended,dlc,data\r\n0,100,0,1,AB\r\n0.1,101,0,1,CD\r\n'
		);
		expect(list.map((f) => [f.id, f.data[0]])).toEqual([
			[0x100, 0xab],
			[0x101, 0xcd]
		]);
	});

	it('follows a user-corrected layout (decimal IDs)', async () => {
		const layout: CaptureLayout = { ...CANONICAL_LAYOUT, idFormat: 'decimal' };
		const { list, layoutNotes } = await frames('time,id,extended,dlc,data\n0,864,0,1,01\n', layout);
		expect(list[0].id).toBe(0x360);
		expect(layoutNotes).toEqual([]);
	});
});

describe('capture ingest: layouts without a header', () => {
	it('finds flag, DLC and byte columns by content', async () => {
		const { layout, list } = await frames(
			'0.000100;18FF1027;1;3;9E;0F;F4\n0.000200;100;0;2;01;02;\n'
		);
		expect(layout).toMatchObject({
			delimiter: ';',
			hasHeader: false,
			extendedColumn: 2,
			dlcColumn: 3,
			byteColumns: [4, 5, 6]
		});
		expect(list.map((f) => f.data)).toEqual([
			[0x9e, 0x0f, 0xf4],
			[1, 2]
		]);
	});

	it('rejects a hand-corrected layout that names no data column', async () => {
		const layout = { ...CANONICAL_LAYOUT, dataColumn: null };
		await expect(ingestCapture('0,100,0,1,01\n', { layout })).rejects.toThrow(
			/layout is not valid: dataColumn/
		);
	});
});

describe('capture ingest: sources', () => {
	const csv = 'time,id,extended,dlc,data\n0,100,0,2,C3 A9\n0.5,200,0,1,01\n';

	it('reads a web ReadableStream of bytes split at every byte', async () => {
		const bytes = new TextEncoder().encode(csv);
		const stream = new ReadableStream<Uint8Array>({
			start(controller) {
				for (const b of bytes) controller.enqueue(Uint8Array.of(b));
				controller.close();
			}
		});
		const { store } = await ingestCapture(stream);
		expect(store.count).toBe(2);
		expect(Array.from(store.payload(0))).toEqual([0xc3, 0xa9]);
	});

	it('reads an async iterable of string chunks', async () => {
		async function* chunks() {
			for (let i = 0; i < csv.length; i += 7) yield csv.slice(i, i + 7);
		}
		const { store } = await ingestCapture(chunks());
		expect(Array.from(store.id)).toEqual([0x100, 0x200]);
	});
});

describe('capture ingest: bad input', () => {
	it('reports bad rows by line number and keeps every good row', async () => {
		const csv = [
			'time,id,extended,dlc,data', //                      line 1
			'0.000,100,0,2,0102', //                              line 2 good
			'0.001,10G,0,2,0102', //                              line 3 bad hex ID
			'', //                                                 line 4 empty, skipped
			'0.002,101,0,2,01020', //                             line 5 odd hex digits
			'0.003,102,0,4,0102', //                              line 6 DLC mismatch
			'0.004,800,0,1,01', //                                line 7 standard flag but 12-bit ID
			'0.005,20000000,1,1,01', //                           line 8 above 29 bits
			'abc,103,0,1,01', //                                  line 9 bad time
			'0.006,104,0,10,00112233445566778899', //             line 10: 10 bytes is no CAN length
			'0.0055,105,0,1,07' //                                line 11 good, earlier than line 2's successor
		].join('\n');
		const result = await ingestCapture(csv);
		expect(Array.from(result.store.id)).toEqual([0x100, 0x105]);
		expect(result.badRows.map((r) => r.line)).toEqual([3, 5, 6, 7, 8, 9, 10]);
		expect(result.badRows[0].reason).toMatch(/10G/);
		expect(result.badRows[1].reason).toMatch(/odd number/);
		expect(result.badRows[2].reason).toMatch(/DLC 4 does not match the 2 data bytes/);
		expect(result.badRows[3].reason).toMatch(/11 bits/);
		expect(result.badRows[4].reason).toMatch(/above 0x1FFFFFFF/);
		expect(result.badRows[5].reason).toMatch(/time "abc"/);
		expect(result.badRows[6].reason).toMatch(/not a CAN payload length/);
		expect(result.badRowCount).toBe(7);
		expect(result.warnings.join(' ')).toMatch(/7 row\(s\) could not be read/);
	});

	it('notes times that go backwards but keeps the rows', async () => {
		const result = await ingestCapture(
			'time,id,dlc,data\n0.2,100,1,01\n0.1,100,1,02\n0.3,100,1,03\n'
		);
		expect(result.frameCount).toBe(3);
		expect(result.backwardsTimeCount).toBe(1);
		expect(result.firstBackwardsLine).toBe(3);
	});

	it('caps the stored bad-row list but counts them all', async () => {
		const rows = ['time,id,dlc,data', '0,100,1,01'];
		for (let i = 0; i < MAX_REPORTED_BAD_ROWS + 500; i++) rows.push(`0.1,XYZ,1,01`);
		rows.push('0.2,100,1,02');
		const result = await ingestCapture(rows.join('\n'));
		expect(result.badRows).toHaveLength(MAX_REPORTED_BAD_ROWS);
		expect(result.badRowCount).toBe(MAX_REPORTED_BAD_ROWS + 500);
		expect(result.frameCount).toBe(2);
	});

	it('rejects an empty file with a clear error', async () => {
		await expect(ingestCapture('')).rejects.toThrow(CaptureFormatError);
		await expect(ingestCapture('\n\n  \n')).rejects.toThrow(/empty/);
	});

	it('gives zero frames for a header-only file', async () => {
		const result = await ingestCapture('time,id,extended,dlc,data\n');
		expect(result.frameCount).toBe(0);
		expect(result.store.count).toBe(0);
		expect(result.warnings[0]).toMatch(/no frames/);
	});

	it('explains a file whose columns cannot be recognised', async () => {
		await expect(ingestCapture('hello,world\nfoo,bar\n')).rejects.toThrow(
			/Could not recognise|at least a time/
		);
	});
});
