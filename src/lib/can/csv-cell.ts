/**
 * One CSV cell, as every CSV file Framewright writes spells it (map CSV signal table, share-link
 * export, capture exports, the command line's decode output).
 *
 * - Numbers are written as numbers (`String(n)`, the shortest text that reads back to the same
 *   double), so a spreadsheet still sums them and `-40` stays `-40`.
 * - Text is a formula hazard when a spreadsheet opens the file: a cell starting with `=`, `+`, `-`,
 *   `@`, a tab, a carriage return (or NUL) is run as a formula. Such text gets a leading single
 *   quote, which spreadsheets take as "this is text", and is always double-quoted (the OWASP
 *   "CSV Injection" guidance; OWASP ASVS 5.0 requirement 1.2.10). `readCsvText` undoes it, so a
 *   file we wrote reads back to the same names.
 * - Quoting follows RFC 4180 §2.6–2.7: a field with a comma, quote or line break is quoted, quotes
 *   doubled; edge spaces are quoted too so they survive editors that trim.
 */

/** Text a spreadsheet would run as a formula, after any single quotes added before. */
const FORMULA_START = /^'*[=+\-@\t\r\0]/;
/** Text we neutralised: one added quote before a formula start. */
const NEUTRALISED = /^'+[=+\-@\t\r\0]/;

function quoted(text: string): string {
	return `"${text.replace(/"/g, '""')}"`;
}

/** A text cell: neutralised against formulas, quoted when it must be. */
export function csvText(text: string): string {
	if (FORMULA_START.test(text)) return quoted(`'${text}`);
	return /[",\r\n]|^\s|\s$/.test(text) ? quoted(text) : text;
}

/** A cell of any value: numbers stay numbers, null/undefined are empty, text is `csvText`. */
export function csvCell(value: string | number | boolean | null | undefined): string {
	if (value === null || value === undefined) return '';
	if (typeof value === 'number') return String(value);
	if (typeof value === 'boolean') return value ? '1' : '0';
	return csvText(value);
}

/** A row of cells without its line end. */
export function csvRow(values: readonly (string | number | boolean | null | undefined)[]): string {
	return values.map(csvCell).join(',');
}

/**
 * A text field read back from a file we wrote: the single quote `csvText` put before a formula
 * start is taken off again (a name that itself began with quotes keeps them: one was added).
 */
export function readCsvText(field: string): string {
	return NEUTRALISED.test(field) ? field.slice(1) : field;
}
