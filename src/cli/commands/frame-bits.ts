/** `frame-bits --id ID [--extended] --data HEX`: length, stuff bits and CRC-15 of one frame. */
import { z } from 'zod';
import { parseHexBytes } from '../../lib/can/capture/row-parser';
import { frameBits } from '../../lib/can/frame-bits';
import { canIdArgument, parseCommand } from '../args';
import type { Command } from '../command';
import { EXIT, UsageError } from '../errors';
import { printJson } from '../io';

const schema = z.object({
	id: canIdArgument,
	extended: z.boolean().default(false),
	data: z
		.string({
			error: '--data is required (hex bytes, e.g. --data "11 22 33" or --data 112233; "" for none)'
		})
		.transform((text, ctx) => {
			const buffer = new Uint8Array(64);
			const length = parseHexBytes(text, buffer);
			if (typeof length === 'string') {
				ctx.addIssue({ code: 'custom', message: length });
				return z.NEVER;
			}
			return buffer.slice(0, length);
		}),
	positionals: z.array(z.string()).max(0, 'takes no file arguments')
});

export const command: Command = {
	usage: `Usage: frame-bits --id ID [--extended] --data HEX

Prints JSON {"bits", "stuffBits", "crc"} for one classical CAN data frame (ISO 11898-1):
  bits       SOF through EOF without stuffing (44 + 8n standard, 64 + 8n extended)
  stuffBits  stuff bits this exact frame needs (SOF through the CRC sequence)
  crc        its CRC-15
ID is 0x… hex or decimal; HEX is up to 8 bytes, spaced or not.`,

	async run(argv) {
		const options = parseCommand(
			'frame-bits',
			argv,
			{ id: { type: 'string' }, extended: { type: 'boolean' }, data: { type: 'string' } },
			schema
		);
		let result;
		try {
			result = frameBits(options.id, options.extended, options.data);
		} catch (error) {
			if (error instanceof RangeError) throw new UsageError(`frame-bits: ${error.message}`);
			throw error;
		}
		printJson({ bits: result.bits, stuffBits: result.stuffBits, crc: result.crc });
		return EXIT.ok;
	}
};
