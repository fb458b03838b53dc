import { z } from 'zod';
import { revisionRefSchema } from '$lib/server/map-views';

/**
 * `?mapId=…&rev=<n|r<n>|draft>[&bitrate=…]` of the bus-load route. The bit rate overrides the
 * map's own (to plan a move to another rate); the same limits as a map's bit rate apply.
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

export function readBusLoadQuery(url: URL) {
	return busLoadQuerySchema.safeParse(Object.fromEntries(url.searchParams));
}
