/**
 * `lint --map MAP.json`: every problem in a map as JSON; exit 1 when any is an error. With
 * `--server URL` the map is one on the server (by name or id) as of a revision, linted there.
 */
import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { lintMap, type LintProblem } from '../../lib/can/lint';
import { parseMap } from '../../lib/can/map-json';
import { mapPath, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, InputError } from '../errors';
import { printJson } from '../io';
import { connect, remoteError, serverOption } from '../remote/connection';
import { concreteRevision, findMap, revisionOption, type RevisionChoice } from '../remote/maps';

/** A lint problem, or a format problem when the file is not a valid map at all. */
type ReportedProblem = Omit<LintProblem, 'code'> & { code: LintProblem['code'] | 'format' };

const schema = z
	.object({
		map: mapPath,
		server: serverOption,
		revision: revisionOption.optional(),
		positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map')
	})
	.refine((o) => o.server !== undefined || o.revision === undefined, {
		path: ['revision'],
		message: 'goes with --server (a map file has no revisions)'
	});

/** The problems of a map on the server, as the server's lint reports them. */
async function remoteProblems(
	server: string,
	map: string,
	revision: RevisionChoice
): Promise<LintProblem[]> {
	const remote = await connect(server);
	const summary = await findMap(remote, map);
	const ref = concreteRevision(summary, revision);
	try {
		if (ref === 'draft')
			return (await remote.api('maps.get', { params: { mapId: summary.id } })).lint;
		return (await remote.api('maps.revision', { params: { mapId: summary.id, n: ref } })).lint;
	} catch (error) {
		throw remoteError(error, remote.server);
	}
}

export const command: Command = {
	usage: `Usage: lint --map MAP.json
       lint --server URL --map NAME [--revision N|latest|draft]

Checks a map and prints a JSON array of problems:
  {"severity": "error" | "warning", "code", "message", "frameIndex", "signalIndex", "path"}
A file that is not a valid map is reported the same way (code "format"). Exit 1 if any error.
With --server, --map names a map on the server (its name or id; token from FRAMEWRIGHT_TOKEN) and
--revision picks the snapshot: a number, latest (the default) or draft. See docs/cli.md.`,

	async run(argv) {
		const options = parseCommand(
			'lint',
			argv,
			{ map: { type: 'string' }, server: { type: 'string' }, revision: { type: 'string' } },
			schema
		);
		if (options.server !== undefined) {
			const problems = await remoteProblems(
				options.server,
				options.map,
				options.revision ?? 'latest'
			);
			printJson(problems);
			return problems.some((p) => p.severity === 'error') ? EXIT.failure : EXIT.ok;
		}
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
