/** What every CLI command module exports. */
export interface Command {
	/** Usage text printed by `<command> --help`. */
	usage: string;
	/** Runs with the arguments after the command name; resolves to the exit code. */
	run(argv: string[]): Promise<number>;
}
