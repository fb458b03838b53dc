/** The command line was malformed (unknown command or option, missing or invalid value): exit 2. */
export class UsageError extends Error {
	override name = 'UsageError';
}

/** An input file is missing, unreadable or invalid (bad map, unreadable capture): exit 1. */
export class InputError extends Error {
	override name = 'InputError';
}

export const EXIT = { ok: 0, failure: 1, usage: 2 } as const;
