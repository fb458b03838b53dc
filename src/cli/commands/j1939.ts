/** `j1939 ID`: the SAE J1939-21 fields of a 29-bit identifier. */
import { z } from 'zod';
import { parseJ1939Id } from '../../lib/can/j1939';
import { canIdArgument, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson } from '../io';

const schema = z.object({
	positionals: z.tuple([canIdArgument], { error: 'give exactly one ID, e.g. j1939 0x18FEF100' })
});

export const command: Command = {
	usage: `Usage: j1939 ID

Splits a 29-bit J1939 identifier (0x… hex or decimal) and prints JSON:
  {"priority", "pgn", "sourceAddress", "destinationAddress"}
destinationAddress is null for PDU2 (broadcast) parameter groups.`,

	async run(argv) {
		const { positionals } = parseCommand('j1939', argv, {}, schema);
		const { priority, pgn, sourceAddress, destinationAddress } = parseJ1939Id(positionals[0]);
		printJson({ priority, pgn, sourceAddress, destinationAddress });
		return EXIT.ok;
	}
};
