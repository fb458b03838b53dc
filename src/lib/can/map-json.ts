/**
 * The `framewright-map@1` JSON format (docs/map-format.md): parse with every problem reported by JSON path,
 * serialise with IDs as hex strings, and the JSON Schema generated from the same zod model.
 */
import { z } from 'zod';
import { findJsonSyntaxError } from './json-syntax';
import { canMapSchema, MAP_FORMAT, type CanMap } from './map';

export interface MapProblem {
	/** JSON path such as `frames[2].signals[0].length`; '' for the document itself. */
	path: string;
	message: string;
	/** Position in the text, for JSON syntax errors. */
	line?: number;
	column?: number;
}

export type ParseMapResult = { ok: true; map: CanMap } | { ok: false; problems: MapProblem[] };

/** `['frames', 2, 'signals', 0, 'length']` → `frames[2].signals[0].length`. */
export function formatJsonPath(path: readonly PropertyKey[]): string {
	return path
		.map((key, i) => {
			if (typeof key === 'number') return `[${key}]`;
			const name = String(key);
			if (/^[A-Za-z_$][\w$]*$/.test(name)) return i === 0 ? name : `.${name}`;
			return `[${JSON.stringify(name)}]`;
		})
		.join('');
}

/** zod's default wording, made to read as advice about one field. */
function problemMessage(issue: z.core.$ZodIssue, input: unknown, format: string): string {
	if (issue.code === 'invalid_type') {
		const present = valueAt(input, issue.path) !== undefined;
		return present
			? `expected ${article(issue.expected)}, got ${describeValue(valueAt(input, issue.path))}`
			: `is required (${issue.expected})`;
	}
	if (issue.code === 'unrecognized_keys') {
		return `unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}`;
	}
	if (issue.code === 'invalid_value' && issue.path.length === 1 && issue.path[0] === 'format') {
		return `must be "${format}" (this is not a Framewright ${format.replace(/^framewright-|@\d+$/g, '')} file, or a newer format version)`;
	}
	return issue.message.replace(/^Invalid input: /, '');
}

function article(type: string): string {
	return `${/^[aeiou]/.test(type) ? 'an' : 'a'} ${type}`;
}

function describeValue(value: unknown): string {
	if (value === null) return 'null';
	if (Array.isArray(value)) return 'an array';
	if (typeof value === 'string')
		return `the text ${JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value)}`;
	if (typeof value === 'object') return 'an object';
	return `${typeof value} ${String(value)}`;
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
	let at: unknown = input;
	for (const key of path) {
		if (at === null || typeof at !== 'object') return undefined;
		at = (at as Record<PropertyKey, unknown>)[key];
	}
	return at;
}

/** Parse JSON text or an already-parsed value into a validated map, or list every problem found. */
export function parseMap(input: string | unknown): ParseMapResult {
	const result = parseJsonDocument(input, canMapSchema, MAP_FORMAT);
	return result.ok ? { ok: true, map: result.value } : result;
}

export type ParseDocumentResult<T> = { ok: true; value: T } | { ok: false; problems: MapProblem[] };

/**
 * Any Framewright JSON document (`format` tag + zod schema): JSON syntax errors with line and
 * column, then every schema problem by JSON path, worded as advice.
 */
export function parseJsonDocument<S extends z.ZodType>(
	input: string | unknown,
	schema: S,
	format: string
): ParseDocumentResult<z.output<S>> {
	let value: unknown = input;
	if (typeof input === 'string') {
		const text = input.replace(/^\uFEFF/, ''); // editors on some systems prepend a byte order mark
		try {
			value = JSON.parse(text);
		} catch (error) {
			const found = findJsonSyntaxError(text);
			const where = found ? { line: found.line, column: found.column } : {};
			const detail = found
				? `line ${found.line}, column ${found.column}: ${found.message}`
				: (error as Error).message;
			return {
				ok: false,
				problems: [{ path: '', message: `JSON syntax error at ${detail}`, ...where }]
			};
		}
	}
	const parsed = schema.safeParse(value);
	if (parsed.success) return { ok: true, value: parsed.data };
	return {
		ok: false,
		problems: parsed.error.issues.map((issue) => ({
			path: formatJsonPath(issue.path),
			message: problemMessage(issue, value, format)
		}))
	};
}

/** IDs as "0x…" hex: 3 digits for standard, 8 for extended IDs, so they line up in a file. */
export function formatCanId(id: number, extended: boolean): string {
	return `0x${id
		.toString(16)
		.toUpperCase()
		.padStart(extended ? 8 : 3, '0')}`;
}

/** Pretty JSON in the model's field order; parseMap(serializeMap(m)) gives back m. */
export function serializeMap(map: CanMap): string {
	const document = {
		...map,
		frames: map.frames.map((frame) => ({ ...frame, id: formatCanId(frame.id, frame.extended) }))
	};
	return `${JSON.stringify(document, null, 2)}\n`;
}

/** JSON Schema (draft 2020-12) of the file format — the input side, so defaulted fields are optional. */
export function mapJsonSchema(): Record<string, unknown> {
	return {
		...z.toJSONSchema(canMapSchema, { io: 'input' }),
		$id: 'https://framewright.invalid/schema/framewright-map.schema.json',
		title: 'Framewright map',
		description:
			'A broadcast map (format framewright-map@1): frames and their signals. Bit numbering: payload bit b is bit b % 8 of byte floor(b / 8); startBit is the least significant bit of a signal.'
	};
}
