/**
 * A small RFC 4180 CSV reader that remembers the line each record starts on, so import
 * problems can name the line a person sees in their editor (quoted fields may span lines).
 */

export interface CsvRecord {
	/** 1-based line number where the record starts. */
	line: number;
	fields: string[];
}

export function readCsvRecords(text: string): CsvRecord[] {
	const records: CsvRecord[] = [];
	let fields: string[] = [];
	let field = '';
	let quoted = false;
	let line = 1;
	let recordLine = 1;
	let i = text.charCodeAt(0) === 0xfeff ? 1 : 0; // spreadsheet programs often prepend a byte order mark
	const endRecord = () => {
		fields.push(field);
		// A blank line is not a record.
		if (!(fields.length === 1 && fields[0].trim() === ''))
			records.push({ line: recordLine, fields });
		fields = [];
		field = '';
	};
	for (; i < text.length; i++) {
		const c = text[i];
		if (quoted) {
			if (c === '"' && text[i + 1] === '"') {
				field += '"';
				i++;
			} else if (c === '"') quoted = false;
			else {
				if (c === '\n') line++;
				field += c;
			}
		} else if (c === '"' && field === '') quoted = true;
		else if (c === ',') {
			fields.push(field);
			field = '';
		} else if (c === '\n' || c === '\r') {
			if (c === '\r' && text[i + 1] === '\n') i++;
			endRecord();
			line++;
			recordLine = line;
		} else field += c;
	}
	if (field !== '' || fields.length > 0) endRecord();
	return records;
}
