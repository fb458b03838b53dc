/**
 * A frame definition for an ID the map does not define, from what the capture showed of it: an
 * editor's starting point ("define this frame"), with no signals yet.
 */
import type { IdStatistics } from '../../can/capture/id-statistics';
import { frameSchema, PAYLOAD_LENGTHS, type Frame } from '../../can/map';

/** `Undocumented_0x5F8` / `Undocumented_0x18FF1000`: the ID in the name, as an editor would search for it. */
export function undocumentedFrameName(id: number, extended: boolean): string {
	return `Undocumented_0x${id
		.toString(16)
		.toUpperCase()
		.padStart(extended ? 8 : 3, '0')}`;
}

/** The smallest payload length a frame can declare that holds `bytes` (CAN FD lengths step, ISO 11898-1). */
function declarableLength(bytes: number): number {
	return PAYLOAD_LENGTHS.find((n) => n >= bytes) ?? 64;
}

export function undocumentedFrame(
	seen: Pick<
		IdStatistics,
		'id' | 'extended' | 'count' | 'meanPeriodMs' | 'minLength' | 'maxLength'
	>,
	captureName: string
): Frame {
	// A period under 1 ms rounds to 0, which is no cycle time; such a frame is left without one.
	const cycle = seen.meanPeriodMs === null ? null : Math.round(seen.meanPeriodMs);
	return frameSchema.parse({
		name: undocumentedFrameName(seen.id, seen.extended),
		id: seen.id,
		extended: seen.extended,
		length: declarableLength(seen.maxLength),
		cycleMs: cycle !== null && cycle >= 1 && cycle <= 3_600_000 ? cycle : null,
		comment: `Defined from capture "${captureName}": ${seen.count} frames, ${seen.minLength === seen.maxLength ? `${seen.maxLength} bytes` : `${seen.minLength}–${seen.maxLength} bytes`}${seen.meanPeriodMs === null ? '' : `, mean period ${seen.meanPeriodMs.toFixed(2)} ms`}. Signals still to be defined.`
	});
}
