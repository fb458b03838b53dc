/** Node-side file access for the CLI: maps are read whole, captures are streamed. */
import { createReadStream } from 'node:fs';
import { readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import type { CanMap } from '../lib/can/map';
import { parseMap, type MapProblem } from '../lib/can/map-json';
import { InputError } from './errors';

function describeFsError(path: string, error: unknown): string {
	const code = (error as NodeJS.ErrnoException).code;
	if (code === 'ENOENT') return `${path}: no such file`;
	if (code === 'EISDIR') return `${path}: is a folder, not a file`;
	if (code === 'EACCES') return `${path}: permission denied`;
	return `${path}: ${(error as Error).message}`;
}

/** Reads and validates a JSON document; a bad one is one line naming its first problems. */
export async function readDocument<T>(
	path: string,
	what: string,
	parse: (text: string) => { ok: true; value: T } | { ok: false; problems: MapProblem[] }
): Promise<T> {
	let text: string;
	try {
		text = await readFile(path, 'utf8');
	} catch (error) {
		throw new InputError(describeFsError(path, error));
	}
	const result = parse(text);
	if (!result.ok) {
		const shown = result.problems
			.slice(0, 3)
			.map((p) => (p.path ? `${p.path}: ${p.message}` : p.message));
		const more = result.problems.length > 3 ? ` (and ${result.problems.length - 3} more)` : '';
		throw new InputError(`${path} is not a valid ${what}: ${shown.join('; ')}${more}`);
	}
	return result.value;
}

export function readMapFile(path: string): Promise<CanMap> {
	return readDocument(path, 'map', (text) => {
		const result = parseMap(text);
		return result.ok ? { ok: true, value: result.map } : result;
	});
}

/** Opens a capture as an async iterable of byte chunks (a Node file stream is one). */
export async function openCapture(path: string): Promise<AsyncIterable<Uint8Array>> {
	try {
		const info = await stat(path);
		if (info.isDirectory()) throw Object.assign(new Error('folder'), { code: 'EISDIR' });
	} catch (error) {
		throw new InputError(describeFsError(path, error));
	}
	return createReadStream(path, { highWaterMark: 1 << 20 });
}

/**
 * Buffered stdout that respects back-pressure: `write` collects text, `drain` waits until the
 * terminal or pipe has taken it, so a huge decode never piles up in memory.
 */
export function createOutput(stream: NodeJS.WriteStream = process.stdout) {
	let buffer = '';
	const flush = () => {
		if (buffer) stream.write(buffer);
		buffer = '';
	};
	return {
		write(text: string) {
			buffer += text;
			if (buffer.length >= 1 << 16) flush();
		},
		async drain() {
			flush();
			if (stream.writableNeedDrain)
				await new Promise<void>((resolve) => stream.once('drain', resolve));
		},
		async end() {
			flush();
			await new Promise<void>((resolve) => stream.write('', () => resolve()));
		}
	};
}

export const printJson = (value: unknown) =>
	process.stdout.write(`${JSON.stringify(value, null, 2)}\n`);

/** Writes through a temporary file and a rename, so a failed run never leaves half a file behind. */
export async function writeWhole(path: string, text: string | Uint8Array): Promise<void> {
	const temporary = `${path}.${process.pid}.tmp`;
	try {
		await writeFile(temporary, text);
		await rename(temporary, path);
	} catch (error) {
		await rm(temporary, { force: true });
		throw new InputError(`${path}: ${(error as Error).message}`);
	}
}
