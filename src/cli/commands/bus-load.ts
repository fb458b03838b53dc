/** `bus-load --map MAP.json [--bitrate BPS] [--data-bitrate BPS]`: planned bus load from the map's cycle times. */
import { z } from 'zod';
import { mapBusLoad } from '../../lib/can/busload';
import { mapPath, parseCommand, quantity } from '../args';
import type { Command } from '../command';
import { EXIT, UsageError } from '../errors';
import { printJson, readMapFile } from '../io';

const bitrate = (flag: string, max: number, maxText: string) =>
	quantity(`${flag} (bits per second)`).pipe(
		z
			.number()
			.int(`${flag} must be a whole number`)
			.min(1000, `${flag} must be at least 1000`)
			.max(max, `${flag} must be at most ${maxText}`)
	);

const schema = z.object({
	map: mapPath,
	bitrate: bitrate('--bitrate', 8_000_000, '8M').optional(),
	'data-bitrate': bitrate('--data-bitrate', 16_000_000, '16M').optional(),
	positionals: z.array(z.string()).max(0, 'takes no file arguments besides --map')
});

export const command: Command = {
	usage: `Usage: bus-load --map MAP.json [--bitrate BPS] [--data-bitrate BPS]

Prints JSON {"bitrate", "dataBitrate", "nominalPercent", "worstCasePercent", "frames": [...]} from the
frames' cycle times: nominal counts unstuffed frames, worst case adds the most stuff bits a frame can
need (Davis et al., 2007). Frames without a cycle time are listed but not counted. --bitrate overrides
the map's. CAN FD frames (more than 8 bytes) send their data phase at --data-bitrate (at least the
nominal bit rate; without it, at the nominal rate); percentages are of bus time.`,

	async run(argv) {
		const options = parseCommand(
			'bus-load',
			argv,
			{
				map: { type: 'string' },
				bitrate: { type: 'string' },
				'data-bitrate': { type: 'string' }
			},
			schema
		);
		const map = await readMapFile(options.map);
		let load;
		try {
			load = mapBusLoad(map, options.bitrate ?? map.bitrate, options['data-bitrate']);
		} catch (error) {
			// The one check that needs the map: a data bit rate below the nominal one.
			if (error instanceof RangeError) throw new UsageError(`bus-load: ${error.message}`);
			throw error;
		}
		printJson({
			bitrate: load.bitrate,
			dataBitrate: load.dataBitrate,
			nominalPercent: load.nominalPercent,
			worstCasePercent: load.worstCasePercent,
			frames: load.frames
		});
		return EXIT.ok;
	}
};
