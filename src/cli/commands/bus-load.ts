/** `bus-load --map MAP.json [--bitrate BPS]`: planned bus load from the map's cycle times. */
import { z } from 'zod';
import { mapBusLoad } from '../../lib/can/busload';
import { mapPath, parseCommand, quantity } from '../args';
import type { Command } from '../command';
import { EXIT } from '../errors';
import { printJson, readMapFile } from '../io';

const schema = z.object({
	map: mapPath,
	bitrate: quantity('--bitrate (bits per second)')
		.pipe(
			z
				.number()
				.int('--bitrate must be a whole number')
				.min(1000, '--bitrate must be at least 1000')
				.max(8_000_000, '--bitrate must be at most 8M')
		)
		.optional(),
	positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map')
});

export const command: Command = {
	usage: `Usage: bus-load --map MAP.json [--bitrate BPS]

Prints JSON {"bitrate", "nominalPercent", "worstCasePercent", "frames": [...]} from the frames' cycle
times: nominal counts unstuffed frames, worst case uses the stuff-bit bound of Davis et al. (2007).
Frames without a cycle time and CAN FD frames are listed but not counted. --bitrate overrides the map's.`,

	async run(argv) {
		const options = parseCommand(
			'bus-load',
			argv,
			{ map: { type: 'string' }, bitrate: { type: 'string' } },
			schema
		);
		const map = await readMapFile(options.map);
		const load = mapBusLoad(map, options.bitrate ?? map.bitrate);
		printJson({
			bitrate: load.bitrate,
			nominalPercent: load.nominalPercent,
			worstCasePercent: load.worstCasePercent,
			frames: load.frames
		});
		return EXIT.ok;
	}
};
