/** `lint --map MAP.json`: every problem in a map as JSON; exit 1 when any is an error. */
import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { lintMap, type LintProblem } from '../../lib/can/lint';
import { parseMap } from '../../lib/can/map-json';
import { mapPath, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { printJson } from '../io';

/** A lint problem, or a format problem when the file is not a valid map at all. */
type ReportedProblem = Omit<LintProblem, 'code'> & { code: LintProblem['code'] | 'format' };

const schema = z.object({
	map: mapPath,
	positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map')
});

export const command: Command = {
	usage: `Usage: lint --map MAP.json

Checks a map and prints a JSON array of problems:
  {"severity": "error" | "warning", "code", "message", "frameIndex", "signalIndex", "path"}
A file that is not a valid map is reported the same way (code "format"). Exit 1 if any error.`,

	async run(argv) {
		const options = parseCommand('lint', argv, { map: { type: 'string' } }, schema);
		let text: string;
		try {
			text = await readFile(options.map, 'utf8');
		} catch (error) {
			const code = (error as NodeJS.ErrnoException).code;
			throw new InputError(
				`${options.map}: ${code === 'ENOENT' ? 'no such file' : (error as Error).message}`
			);
		}
		const parsed = parseMap(text);
		const problems: ReportedProblem[] = parsed.ok
			? lintMap(parsed.map)
			: parsed.problems.map((p) => ({
					severity: 'error',
					code: 'format',
					message: p.message,
					frameIndex: null,
					signalIndex: null,
					path: p.path
				}));
		printJson(problems);
		return problems.some((p) => p.severity === 'error') ? EXIT.failure : EXIT.ok;
	}
};
