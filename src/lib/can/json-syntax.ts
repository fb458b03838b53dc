/**
 * Locates the first syntax error in JSON text (RFC 8259 grammar) with line and column, because
 * JSON.parse messages differ between engines and some give no position at all.
 * Only called after JSON.parse has failed, so speed does not matter; clarity does.
 */
export interface JsonSyntaxError {
	/** 0-based character offset. */
	offset: number;
	/** 1-based line and column. */
	line: number;
	column: number;
	message: string;
}

class SyntaxProblem {
	constructor(
		readonly offset: number,
		readonly message: string
	) {}
}

function describe(ch: string | undefined): string {
	if (ch === undefined) return 'end of input';
	if (ch === '\n') return 'a line break';
	return `"${ch}"`;
}

function scan(text: string): void {
	let i = 0;
	const fail = (message: string, at = i): never => {
		throw new SyntaxProblem(at, message);
	};
	const skipSpace = () => {
		while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
	};
	const literal = (word: string) => {
		if (text.startsWith(word, i)) i += word.length;
		else fail(`unknown word "${/^\w*/.exec(text.slice(i))![0]}"; did you mean ${word}?`);
	};
	const string = () => {
		i++; // opening quote
		for (;;) {
			const ch = text[i];
			if (ch === undefined) fail('unterminated string: missing closing quote');
			if (ch === '"') break;
			if (ch < ' ')
				fail('line break or control character inside a string (write it as \\n, \\t …)');
			if (ch === '\\') {
				const next = text[i + 1];
				if (next === 'u') {
					if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6)))
						fail('\\u must be followed by 4 hex digits');
					i += 6;
					continue;
				}
				if (next === undefined || !'"\\/bfnrt'.includes(next))
					fail(`invalid escape \\${next ?? ''} in string`);
				i += 2;
				continue;
			}
			i++;
		}
		i++; // closing quote
	};
	const number = () => {
		const start = i;
		const match = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i));
		if (!match) fail(`invalid number starting with ${describe(text[i])}`);
		i += match![0].length;
		if (/[0-9.eExX]/.test(text[i] ?? '')) {
			fail(
				'invalid number (JSON numbers are decimal without leading zeros; write hex IDs as strings like "0x360")',
				start
			);
		}
	};
	const value = (): void => {
		skipSpace();
		const ch = text[i];
		if (ch === '{') return object();
		if (ch === '[') return array();
		if (ch === '"') return string();
		if (ch === '-' || (ch >= '0' && ch <= '9')) return number();
		if (ch === 't') return literal('true');
		if (ch === 'f') return literal('false');
		if (ch === 'n') return literal('null');
		if (ch === "'") fail('strings must use double quotes');
		fail(
			ch === undefined
				? 'unexpected end of input: a value is missing'
				: `unexpected ${describe(ch)} where a value should be`
		);
	};
	const object = () => {
		i++;
		skipSpace();
		if (text[i] === '}') return void i++;
		for (;;) {
			skipSpace();
			if (text[i] !== '"')
				fail(`expected a property name in double quotes, found ${describe(text[i])}`);
			string();
			skipSpace();
			if (text[i] !== ':') fail(`expected ":" after the property name, found ${describe(text[i])}`);
			i++;
			value();
			skipSpace();
			if (text[i] === '}') return void i++;
			if (text[i] !== ',') fail(`expected "," or "}" after a property, found ${describe(text[i])}`);
			const comma = i++;
			skipSpace();
			if (text[i] === '}') fail('trailing comma before "}"', comma);
		}
	};
	const array = () => {
		i++;
		skipSpace();
		if (text[i] === ']') return void i++;
		for (;;) {
			value();
			skipSpace();
			if (text[i] === ']') return void i++;
			if (text[i] !== ',') fail(`expected "," or "]" after an item, found ${describe(text[i])}`);
			const comma = i++;
			skipSpace();
			if (text[i] === ']') fail('trailing comma before "]"', comma);
		}
	};
	value();
	skipSpace();
	if (i < text.length) fail(`unexpected ${describe(text[i])} after the end of the JSON value`);
}

/** Line and column (1-based) of a character offset. */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
	const before = text.slice(0, offset);
	const line = before.split('\n').length;
	return { line, column: offset - before.lastIndexOf('\n') };
}

/** The first syntax error in `text`, or null when it is valid JSON. */
export function findJsonSyntaxError(text: string): JsonSyntaxError | null {
	try {
		scan(text);
		return null;
	} catch (error) {
		if (!(error instanceof SyntaxProblem)) throw error; // e.g. stack overflow on absurd nesting
		return { offset: error.offset, ...lineColumn(text, error.offset), message: error.message };
	}
}
