/** `bit-timing --clock HZ --bitrate BPS [--sample-point 0.875]`: controller settings, best first. */
import { z } from 'zod';
import { bitTimingOptions } from '../../lib/can/bit-timing';
import { parseCommand, quantity } from '../args';
import type { Command } from '../command';
import { EXIT, UsageError } from '../errors';
import { printJson } from '../io';

const schema = z.object({
	clock: quantity('--clock (controller clock in Hz)'),
	bitrate: quantity('--bitrate (bits per second)'),
	'sample-point': z
		.string()
		.regex(/^0?\.\d+$/, 'give the sample point as a fraction such as 0.875')
		.transform(Number)
		.optional(),
	positionals: z.array(z.string()).max(0, 'takes no file arguments')
});

export const command: Command = {
	usage: `Usage: bit-timing --clock HZ --bitrate BPS [--sample-point 0.875]

Prints a JSON array of prescaler and segment settings (ISO 11898-1 bit time), best first:
  {"prescaler", "tseg1", "tseg2", "sjw", "timeQuanta", "samplePoint", "bitrateError"}
Numbers may use k or M (16M, 500k). Without --sample-point a usual one for the bit rate is used.
An empty array means the clock cannot make that bit rate closely enough.`,

	async run(argv) {
		const options = parseCommand(
			'bit-timing',
			argv,
			{
				clock: { type: 'string' },
				bitrate: { type: 'string' },
				'sample-point': { type: 'string' }
			},
			schema
		);
		let settings;
		try {
			settings = bitTimingOptions({
				clockHz: options.clock,
				bitrate: options.bitrate,
				samplePoint: options['sample-point']
			});
		} catch (error) {
			if (error instanceof RangeError) throw new UsageError(`bit-timing: ${error.message}`);
			throw error;
		}
		printJson(settings);
		if (settings.length === 0)
			process.stderr.write(
				'bit-timing: no prescaler and segment split reaches this bit rate from this clock\n'
			);
		return EXIT.ok;
	}
};
