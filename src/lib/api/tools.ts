/**
 * The contract of the workspace tools' JSON route (`/api/workspaces/{ws}/tools/bus-load`).
 */
import { z } from 'zod';
import { mapBusLoadSchema } from '../can/busload';
import { revisionRefSchema } from './maps';
import { named } from './shapes';

/**
 * `?mapId=…&rev=<n|r<n>|draft>[&bitrate=…]`. The bit rate overrides the map's own (to plan a move
 * to another rate); the same limits as a map's bit rate apply.
 */
export const busLoadQuerySchema = z.strictObject({
	mapId: z
		.string({ error: 'Choose a map (mapId is missing).' })
		.trim()
		.min(1, 'Choose a map (mapId is empty).')
		.max(100, 'mapId is too long to be a map id.'),
	rev: revisionRefSchema.default('draft'),
	bitrate: z
		.string()
		.trim()
		.regex(/^\d{1,7}$/, 'bitrate must be a whole number of bits per second, like 500000')
		.transform(Number)
		.pipe(
			z
				.number()
				.min(1000, 'bitrate must be at least 1000 bit/s')
				.max(8_000_000, 'bitrate must be at most 8 Mbit/s')
		)
		.optional()
});

/** Planned bus load of one map revision (or its draft); the Tools page reads the same type. */
export const busLoadResponseSchema = z.object({
	map: z.object({ id: z.string(), name: z.string() }),
	/** "r3" or "draft". */
	label: z.string(),
	/** `mapBusLoad` of that snapshot, untouched. */
	busLoad: named(
		mapBusLoadSchema,
		'MapBusLoad',
		'Bus load per frame and in total, nominal and worst case (docs/cli.md, bus-load).'
	),
	/** Per frame (same order as busLoad.frames): what the table shows beside the load. */
	frames: z.array(
		z.object({ extended: z.boolean(), length: z.number().int(), cycleMs: z.number().nullable() })
	)
});
export type BusLoadResponse = z.infer<typeof busLoadResponseSchema>;
