/** `codegen --map MAP.json --out DIR [--prefix fw] [--revision LABEL]`: C99 code for firmware. */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { z } from 'zod';
import { CODEGEN_VERSION, generateC } from '../../lib/can/codegen/generate';
import { codegenPrefixSchema } from '../../lib/can/codegen/identifiers';
import { mapPath, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { printJson, readMapFile, writeWhole } from '../io';

const schema = z.object({
	map: mapPath,
	out: z.string({ error: '--out DIR is required' }).min(1, '--out needs a folder name'),
	prefix: codegenPrefixSchema.default('fw'),
	revision: z
		.string()
		.trim()
		.min(1, '--revision needs a label such as r7')
		.max(60, '--revision must be at most 60 characters')
		.optional(),
	positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map')
});

export const command: Command = {
	usage: `Usage: codegen --map MAP.json --out DIR [--prefix fw] [--revision LABEL]

Writes DIR/<prefix>.h and DIR/<prefix>.c: C99 code that decodes and encodes the map's frames
(per frame <PREFIX>_<FRAME>_ID/_LENGTH, a struct of double values, <prefix>_<frame>_decode/_encode,
raw pack/unpack helpers per signal, a PGN match on J1939 frames). Names are the map's names in
snake_case; a name that makes no valid or no unique C identifier is changed and a note says so.
--prefix (default fw) starts every identifier and names the files; --revision is shown in the header
comment. DIR is created if missing; existing files of the same name are replaced.
Prints JSON {"files", "prefix", "frames", "signals", "notes"}; notes also go to stderr.
See docs/codegen.md.`,

	async run(argv) {
		const options = parseCommand(
			'codegen',
			argv,
			{
				map: { type: 'string' },
				out: { type: 'string' },
				prefix: { type: 'string' },
				revision: { type: 'string' }
			},
			schema
		);
		const map = await readMapFile(options.map);
		const result = generateC(map, {
			prefix: options.prefix,
			mapName: map.name,
			revision: options.revision ?? null,
			generatorVersion: `Framewright codegen ${CODEGEN_VERSION}`
		});
		try {
			await mkdir(options.out, { recursive: true });
		} catch (error) {
			const code = (error as NodeJS.ErrnoException).code;
			throw new InputError(
				code === 'EEXIST' || code === 'ENOTDIR'
					? `${options.out}: is a file, not a folder`
					: `${options.out}: ${(error as Error).message}`
			);
		}
		const files = [
			[join(options.out, `${options.prefix}.h`), result.header],
			[join(options.out, `${options.prefix}.c`), result.source]
		] as const;
		for (const [path, text] of files) await writeWhole(path, text);
		for (const note of result.notes) process.stderr.write(`note: ${note.path}: ${note.message}\n`);
		printJson({
			files: files.map(([path]) => path),
			prefix: options.prefix,
			frames: result.frames.length,
			signals: result.frames.reduce((sum, f) => sum + f.signals.length, 0),
			notes: result.notes
		});
		return EXIT.ok;
	}
};
