import { describe, expect, it } from 'vitest';
import { CANONICAL_LAYOUT, type CaptureLayout } from '$lib/can/capture/layout';
import {
	columnChoices,
	columnRoles,
	layoutProblems,
	previewRows,
	resplitSample,
	withDataColumns
} from './layout-model';

// The canonical layout's own header and two rows (docs/capture-csv.md), one with bad hex.
const canonical = [
	['time', 'id', 'extended', 'dlc', 'data'],
	['0.5', '5F0', '0', '2', '15 14'],
	['0.75', '18FEEE00', '1', '1', 'ZZ'],
	['1.25', '0x7FF', '0', '0', '']
];

describe('layout preview', () => {
	it('reads rows after the header with the core row parser, times from the first good row', () => {
		const rows = previewRows(CANONICAL_LAYOUT, canonical);
		expect(rows.map((r) => r.line)).toEqual([2, 3, 4]);
		expect(rows[0].frame).toEqual({
			time: 0,
			id: '0x5F0',
			extended: false,
			length: 2,
			dataHex: '15 14'
		});
		expect(rows[1].frame).toBeNull();
		expect(rows[1].error).toMatch(/hex|ZZ/i);
		expect(rows[2].frame?.time).toBeCloseTo(0.75, 12);
		expect(rows[2].frame?.length).toBe(0);
	});

	it('a millisecond time column is shown in seconds', () => {
		const layout: CaptureLayout = { ...CANONICAL_LAYOUT, hasHeader: false, timeUnit: 'ms' };
		const rows = previewRows(layout, [
			['1000', '100', '0', '1', 'AA'],
			['1250', '100', '0', '1', 'AB']
		]);
		expect(rows.map((r) => r.frame?.time)).toEqual([0, 0.25]);
	});

	it('an impossible layout previews nothing and names its problems', () => {
		const both: CaptureLayout = { ...CANONICAL_LAYOUT, byteColumns: [5, 6] };
		expect(previewRows(both, canonical)).toEqual([]);
		expect(layoutProblems(both, 5).join('\n')).toMatch(/dataColumn/);
		expect(layoutProblems({ ...CANONICAL_LAYOUT, idColumn: 9 }, 5)).toContain(
			'column 10 is not in the file (it has 5)'
		);
		expect(layoutProblems({ ...CANONICAL_LAYOUT, idColumn: 0 }, 5)).toContain(
			'two fields are read from the same column'
		);
		expect(layoutProblems(CANONICAL_LAYOUT, 5)).toEqual([]);
	});
});

describe('layout editing', () => {
	it('labels each column with what it is read as', () => {
		expect(columnRoles(CANONICAL_LAYOUT, 6)).toEqual([
			'time (s)',
			'ID (hex)',
			'extended flag',
			'DLC (code or bytes)',
			'data (hex bytes)',
			'ignored'
		]);
		const bytes = withDataColumns(CANONICAL_LAYOUT, 'bytes', 4, 2);
		expect(bytes.dataColumn).toBeNull();
		expect(columnRoles(bytes, 6).slice(4)).toEqual(['byte 0', 'byte 1']);
		expect(withDataColumns(bytes, 'single', 4)).toEqual(CANONICAL_LAYOUT);
	});

	it('column choices carry the header names only when the first row is a header', () => {
		expect(columnChoices(canonical, { hasHeader: true })[1]).toEqual({ value: 1, label: '2 · id' });
		expect(columnChoices(canonical, { hasHeader: false })[1]).toEqual({
			value: 1,
			label: 'column 2'
		});
	});

	it('re-splits the sample when the delimiter is corrected', () => {
		const asOneColumn = [['time;id;data'], ['0.1;100;AA BB']];
		expect(resplitSample(asOneColumn, ',', ';')).toEqual([
			['time', 'id', 'data'],
			['0.1', '100', 'AA BB']
		]);
		expect(resplitSample(canonical, ',', ',')).toBe(canonical);
	});
});
