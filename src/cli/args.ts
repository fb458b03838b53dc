/**
 * Option parsing for the commands: node's util.parseArgs for the syntax, a zod schema for the
 * values, and every problem turned into a one-line UsageError.
 */
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { z } from 'zod';
import { UsageError } from './errors';

type Options = NonNullable<ParseArgsConfig['options']>;

export function parseCommand<S extends z.ZodType>(
	command: string,
	argv: string[],
	options: Options,
	schema: S
): z.output<S> {
	let parsed;
	try {
		parsed = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
	} catch (error) {
		// parseArgs messages are clear but long; keep the first sentence.
		throw new UsageError(
			`${command}: ${(error as Error).message.split('. ')[0].replace(/\.$/, '')}`
		);
	}
	const result = schema.safeParse({ ...parsed.values, positionals: parsed.positionals });
	if (!result.success) {
		const issue = result.error.issues[0];
		const field = issue.path.length
			? `${issue.path[0] === 'positionals' ? 'argument' : `--${String(issue.path[0])}`}: `
			: '';
		throw new UsageError(`${command}: ${field}${issue.message}`);
	}
	return result.data;
}

/** A positive number written plainly, in exponent form, or with a k/M suffix ("500k", "16M"). */
export const quantity = (what: string) =>
	z
		.string({ error: `${what} is required` })
		.trim()
		.transform((s, ctx) => {
			const match = /^(\d+(?:\.\d+)?(?:e\d+)?)\s*([kKmM]?)$/.exec(s);
			if (!match) {
				ctx.addIssue({
					code: 'custom',
					message: `${what} "${s}" is not a number (examples: 500000, 500k, 16M, 1.6e7)`
				});
				return z.NEVER;
			}
			const factor = { '': 1, k: 1e3, K: 1e3, m: 1e6, M: 1e6 }[match[2]]!;
			return Math.round(Number(match[1]) * factor * 1e6) / 1e6;
		});

/** A CAN ID: "0x…" hex or decimal. Bare hex is refused because "100" would be ambiguous. */
export const canIdArgument = z
	.string({ error: 'an ID is required' })
	.trim()
	.transform((s, ctx) => {
		if (/^0[xX][0-9a-fA-F]{1,8}$/.test(s)) return Number.parseInt(s.slice(2), 16);
		if (/^\d{1,10}$/.test(s)) return Number(s);
		ctx.addIssue({
			code: 'custom',
			message: `ID "${s}" must be hex with a 0x prefix (0x18FEF100) or decimal`
		});
		return z.NEVER;
	})
	.pipe(z.number().max(0x1fffffff, 'ID is above 0x1FFFFFFF, the largest 29-bit identifier'));

export const mapPath = z
	.string({ error: '--map MAP.json is required' })
	.min(1, '--map needs a file name');

export const profilePath = z
	.string({ error: '--profile PROFILE.json is required' })
	.min(1, '--profile needs a file name');
