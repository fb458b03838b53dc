import { describe, expect, it } from 'vitest';
import { csvRow, csvText } from './csv-cell';
import { readCsvRecords } from './csv-records';

describe('readCsvRecords', () => {
	// RFC 4180 §2 rules 5–7: quoted fields, commas and line breaks inside quotes, "" for a quote.
	it.each([
		['RFC 4180 §2.6 comma inside quotes', '"aaa","b,bb","ccc"', [['aaa', 'b,bb', 'ccc']]],
		['RFC 4180 §2.7 doubled quote', '"aaa","b""bb","ccc"', [['aaa', 'b"bb', 'ccc']]],
		[
			'RFC 4180 §2.6 line break inside quotes',
			'"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx',
			[
				['aaa', 'b\r\nbb', 'ccc'],
				['zzz', 'yyy', 'xxx']
			]
		],
		[
			'RFC 4180 §2.4 empty fields',
			'a,,c\r\n,,',
			[
				['a', '', 'c'],
				['', '', '']
			]
		]
	])('%s', (_name, text, expected) => {
		expect(readCsvRecords(text).map((r) => r.fields)).toEqual(expected);
	});

	it('numbers records by the line they start on, across quoted line breaks and blank lines', () => {
		const records = readCsvRecords('h1,h2\n"multi\nline",x\n\nlast,y\n');
		expect(records.map((r) => r.line)).toEqual([1, 2, 5]);
	});

	it('ignores a byte order mark', () => {
		expect(readCsvRecords('\uFEFFa,b')[0].fields).toEqual(['a', 'b']);
	});
});

describe('csvRow', () => {
	it('quotes only what needs quoting, and reads back the same fields', () => {
		const fields = ['plain', 'with,comma', 'say "hi"', 'two\nlines', ' edge', ''];
		expect(csvText('plain')).toBe('plain');
		expect(csvText('say "hi"')).toBe('"say ""hi"""');
		expect(readCsvRecords(csvRow(fields))[0].fields).toEqual(fields);
	});
});
