import { describe, expect, it } from 'vitest';
import { findJsonSyntaxError, lineColumn } from './json-syntax';

describe('findJsonSyntaxError', () => {
	// RFC 8259 is the grammar; JSON.parse (ECMAScript) is the reference for valid/invalid.
	it.each([
		['{"a": 1,}', 1, 8, /trailing comma/],
		['{"a" 1}', 1, 6, /expected ":"/],
		['{\n  "a": 1\n  "b": 2\n}', 3, 3, /expected "," or "}"/],
		['{"id": 0x360}', 1, 8, /hex IDs as strings/],
		["{'a': 1}", 1, 2, /double quotes/],
		['[1, 2', 1, 6, /expected "," or "\]"/],
		['{"a": "x\ny"}', 1, 9, /line break/],
		['{"a": tru}', 1, 7, /did you mean true/],
		['{} {}', 1, 4, /after the end/],
		['', 1, 1, /value is missing/]
	])('%j → line %i, column %i', (text, line, column, message) => {
		expect(() => JSON.parse(text)).toThrow(SyntaxError); // the reference agrees it is invalid
		const error = findJsonSyntaxError(text);
		expect(error).toMatchObject({ line, column });
		expect(error?.message).toMatch(message);
	});

	it.each(['{}', '[]', '{"a":[1,-2.5e3,true,false,null,"\\u00e9\\n"]}', ' 0 ', '"x"'])(
		'accepts valid JSON %j like JSON.parse',
		(text) => {
			expect(() => JSON.parse(text)).not.toThrow();
			expect(findJsonSyntaxError(text)).toBeNull();
		}
	);
});

describe('lineColumn', () => {
	it('counts from 1', () => {
		expect(lineColumn('ab\ncd', 0)).toEqual({ line: 1, column: 1 });
		expect(lineColumn('ab\ncd', 4)).toEqual({ line: 2, column: 2 });
	});
});
