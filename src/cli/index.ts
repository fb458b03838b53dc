/**
 * Framewright command line: `npm run -s cli -- <command> …`. Machine-readable results go to stdout,
 * messages to stderr. Exit codes: 0 done, 1 invalid input file, problems found or a refusal of the
 * server, 2 bad usage. Commands with `--server URL` work against a running Framewright.
 */
import type { Command } from './command';
import { EXIT, InputError, UsageError } from './errors';

/** Commands load lazily, so each starts fast and pulls in only what it uses. */
const COMMANDS: Record<string, { summary: string; load: () => Promise<{ command: Command }> }> = {
	decode: {
		summary: 'decode --map MAP.json CAPTURE.csv    decoded signal samples as CSV',
		load: () => import('./commands/decode')
	},
	j1939: {
		summary: 'j1939 ID                             J1939 fields of a 29-bit ID',
		load: () => import('./commands/j1939')
	},
	'frame-bits': {
		summary: 'frame-bits --id ID [--extended] --data HEX   bits, stuff bits, CRC-15',
		load: () => import('./commands/frame-bits')
	},
	'bit-timing': {
		summary: 'bit-timing --clock HZ --bitrate BPS [--sample-point F]   controller settings',
		load: () => import('./commands/bit-timing')
	},
	'bus-load': {
		summary: 'bus-load --map MAP.json [--bitrate BPS] [--data-bitrate BPS]   planned bus load',
		load: () => import('./commands/bus-load')
	},
	lint: {
		summary: 'lint --map MAP.json                  problems in a map (exit 1 on errors)',
		load: () => import('./commands/lint')
	},
	codegen: {
		summary: 'codegen --map MAP.json --out DIR [--prefix fw]   C99 code for firmware',
		load: () => import('./commands/codegen')
	},
	link: {
		summary: 'link --map MAP.json --profile PROFILE.json   link a receiver profile to a map',
		load: () => import('./commands/link')
	},
	'receive-set': {
		summary: 'receive-set --map MAP.json --profile PROFILE.json   receive set of a linked profile',
		load: () => import('./commands/receive-set')
	},
	fields: {
		summary:
			'fields CAPTURE.csv [--id ID]         proposed fields of each ID (counters, checksums…)',
		load: () => import('./commands/fields')
	},
	maps: {
		summary: 'maps --server URL                    maps of the token’s workspace',
		load: () => import('./commands/maps')
	},
	pull: {
		summary: 'pull --server URL --map NAME [--revision N|latest|draft] [--out FILE]   map JSON',
		load: () => import('./commands/pull')
	},
	push: {
		summary: 'push --server URL --map NAME --version N DRAFT.json   replace the draft',
		load: () => import('./commands/push')
	},
	publish: {
		summary: 'publish --server URL --map NAME --version N --note TEXT   next revision',
		load: () => import('./commands/publish')
	},
	upload: {
		summary: 'upload --server URL [--name NAME] CAPTURE.csv   upload and process a capture',
		load: () => import('./commands/upload')
	}
};

const HELP = `Framewright command line

Usage: npm run -s cli -- <command> [options]

${Object.values(COMMANDS)
	.map((c) => `  ${c.summary}`)
	.join('\n')}

lint and decode also work against a server: add --server URL (and --revision), with --map naming
the map there. Remote commands read the access token from FRAMEWRIGHT_TOKEN (docs/cli.md).

Run "<command> --help" for details. Output on stdout is JSON or CSV; messages go to stderr.
Exit codes: 0 done, 1 invalid input, problems found or refused by the server, 2 bad usage.`;

export async function main(argv: string[]): Promise<number> {
	const [name, ...rest] = argv;
	if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
		// Asked for: stdout. Missing command: a usage error, so stderr and exit 2.
		(name === undefined ? process.stderr : process.stdout).write(`${HELP}\n`);
		return name === undefined ? EXIT.usage : EXIT.ok;
	}
	const entry = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
	if (!entry)
		throw new UsageError(
			`unknown command "${name}"; commands: ${Object.keys(COMMANDS).join(', ')}`
		);
	const { command } = await entry.load();
	if (rest.includes('--help') || rest.includes('-h')) {
		process.stdout.write(`${command.usage}\n`);
		return EXIT.ok;
	}
	return command.run(rest);
}

// A closed pipe (e.g. `… | head`) is a normal way for a reader to stop.
process.stdout.on('error', (error: NodeJS.ErrnoException) => {
	if (error.code === 'EPIPE') process.exit(EXIT.ok);
	throw error;
});

main(process.argv.slice(2)).then(
	(code) => {
		process.exitCode = code;
	},
	(error: unknown) => {
		if (error instanceof UsageError) {
			process.stderr.write(`error: ${error.message} (see --help)\n`);
			process.exitCode = EXIT.usage;
		} else if (error instanceof InputError) {
			process.stderr.write(`error: ${error.message}\n`);
			process.exitCode = EXIT.failure;
		} else {
			process.stderr.write(`error: ${error instanceof Error ? error.message : String(error)}\n`);
			process.exitCode = EXIT.failure;
		}
	}
);
