/**
 * Bit timing: prescaler and segment settings that make a controller clock produce a bit rate.
 * ISO 11898-1 divides a bit into time quanta (tq): sync segment (always 1 tq), then tseg1
 * (propagation + phase segment 1), the sample point, then tseg2 (phase segment 2).
 */
import { z } from 'zod';

/**
 * Caution for any screen or command output that shows computed settings: a wrong bit rate or
 * sample point on one node disturbs every frame on the bus.
 */
export const BIT_TIMING_CAUTION =
	'Check these settings against the controller’s reference manual and the vehicle maker’s network ' +
	'documentation before use. A node with a wrong bit rate or sample point disrupts the whole bus: ' +
	'change bus settings only with the vehicle safely parked, ignition off, following the maker’s procedure.';

/** Register ranges most CAN controllers accept (common practice; individual chips differ). */
export const TIMING_LIMITS = {
	prescaler: { min: 1, max: 1024 },
	timeQuanta: { min: 8, max: 25 },
	tseg1: { min: 2, max: 16 },
	tseg2: { min: 1, max: 8 },
	sjw: { max: 4 }
} as const;

/**
 * Largest bit-rate error accepted: 0.5 %. Common practice (from memory): the clock tolerance
 * CAN allows (roughly 0.4–1.5 % depending on the timing) is shared by the oscillator and the
 * rate error, so settings should be well under 1 %.
 */
export const MAX_BITRATE_ERROR = 0.005;

/**
 * Sample point recommended for a bit rate (CiA 301 table, from memory): 75 % above 800 kbit/s,
 * 80 % above 500 kbit/s up to 800 kbit/s, 87.5 % at 500 kbit/s and below.
 */
export function recommendedSamplePoint(bitrate: number): number {
	if (bitrate > 800_000) return 0.75;
	if (bitrate > 500_000) return 0.8;
	return 0.875;
}

export const bitTimingRequestSchema = z.object({
	clockHz: z
		.number({ error: 'clockHz must be a number (controller clock in Hz)' })
		.positive('clockHz must be positive')
		.max(1e9, 'clockHz above 1 GHz is not a CAN controller clock'),
	bitrate: z
		.number({ error: 'bitrate must be a number (bits per second)' })
		.int('bitrate must be a whole number of bits per second')
		.min(1000, 'bitrate must be at least 1000 bit/s')
		.max(8_000_000, 'bitrate must be at most 8 Mbit/s'),
	samplePoint: z
		.number({ error: 'samplePoint must be a fraction like 0.875' })
		.min(0.5, 'samplePoint must be between 0.5 and 0.95 (a fraction, not percent)')
		.max(0.95, 'samplePoint must be between 0.5 and 0.95 (a fraction, not percent)')
		.optional()
});
export type BitTimingRequest = z.input<typeof bitTimingRequestSchema>;

export interface BitTiming {
	prescaler: number;
	/** Propagation + phase segment 1, in tq. */
	tseg1: number;
	/** Phase segment 2, in tq. */
	tseg2: number;
	/** Synchronisation jump width, in tq. */
	sjw: number;
	/** Quanta per bit: 1 (sync) + tseg1 + tseg2. */
	timeQuanta: number;
	/** (1 + tseg1) / timeQuanta. */
	samplePoint: number;
	/** (actual − wanted) / wanted bit rate, as a fraction (0.001 = 0.1 %). */
	bitrateError: number;
}

/**
 * Every valid setting for a clock and bit rate, best first: smallest bit-rate error, then the
 * sample point closest to the wanted one, then more quanta (finer resynchronisation).
 * For each prescaler and quanta count only the split nearest the wanted sample point is kept.
 * SJW is set to min(4, tseg2), the largest the common ranges allow (common practice).
 * Throws an Error listing every problem when the request is nonsense; returns [] when the clock
 * cannot make the bit rate.
 */
export function bitTimingOptions(request: BitTimingRequest): BitTiming[] {
	const parsed = bitTimingRequestSchema.safeParse(request);
	if (!parsed.success) {
		throw new RangeError(parsed.error.issues.map((i) => i.message).join('; '));
	}
	const { clockHz, bitrate } = parsed.data;
	const wanted = parsed.data.samplePoint ?? recommendedSamplePoint(bitrate);
	const { prescaler: P, timeQuanta: Q, sjw: S } = TIMING_LIMITS;
	const found: BitTiming[] = [];
	for (let prescaler = P.min; prescaler <= P.max; prescaler++) {
		for (let timeQuanta = Q.min; timeQuanta <= Q.max; timeQuanta++) {
			const bitrateError = clockHz / (prescaler * timeQuanta) / bitrate - 1;
			if (Math.abs(bitrateError) > MAX_BITRATE_ERROR + 1e-12) continue;
			const split = nearestSplit(timeQuanta, wanted);
			if (!split) continue;
			found.push({
				prescaler,
				tseg1: split.tseg1,
				tseg2: split.tseg2,
				sjw: Math.min(S.max, split.tseg2),
				timeQuanta,
				samplePoint: (1 + split.tseg1) / timeQuanta,
				bitrateError: clean(bitrateError)
			});
		}
	}
	return found.sort(
		(a, b) =>
			clean(Math.abs(a.bitrateError) - Math.abs(b.bitrateError)) ||
			clean(Math.abs(a.samplePoint - wanted) - Math.abs(b.samplePoint - wanted)) ||
			b.timeQuanta - a.timeQuanta
	);
}

/**
 * The tseg1/tseg2 split of `timeQuanta` within the limits whose sample point is nearest `wanted`;
 * on a tie the later sample point wins (it tolerates longer propagation delays).
 */
function nearestSplit(timeQuanta: number, wanted: number): { tseg1: number; tseg2: number } | null {
	const { tseg1: T1, tseg2: T2 } = TIMING_LIMITS;
	let best: { tseg1: number; tseg2: number } | null = null;
	let bestDistance = Infinity;
	for (let tseg2 = T2.min; tseg2 <= T2.max; tseg2++) {
		const tseg1 = timeQuanta - 1 - tseg2;
		if (tseg1 < T1.min || tseg1 > T1.max) continue;
		const distance = clean(Math.abs((1 + tseg1) / timeQuanta - wanted));
		if (distance < bestDistance) {
			best = { tseg1, tseg2 };
			bestDistance = distance;
		}
	}
	return best;
}

/** Rounds away floating-point noise (e.g. 16e6 / 32 / 500e3 − 1 → 0, not 2e-16) so ties stay ties. */
function clean(x: number): number {
	return Math.round(x * 1e12) / 1e12;
}
