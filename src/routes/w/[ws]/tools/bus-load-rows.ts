/**
 * The bus-load table's rows: the API's per-frame loads joined with each frame's ID and cycle time,
 * counted frames heaviest first, frames left out of the totals listed apart with the reason.
 */
import { z } from 'zod';
import type { BusLoadExclusion } from '$lib/can/busload';
import { formatCanId } from '$lib/can/map-json';
import type { BusLoadResponse } from '$lib/api/tools';

export interface CountedFrameRow {
	frameIndex: number;
	name: string;
	idText: string;
	cycleMs: number;
	framesPerSecond: number;
	nominalBitsPerSecond: number;
	worstCaseBitsPerSecond: number;
	nominalPercent: number;
	worstCasePercent: number;
}

export interface UncountedFrameRow {
	frameIndex: number;
	name: string;
	idText: string;
	reason: string;
}

export const EXCLUSION_REASONS: Record<BusLoadExclusion, string> = {
	noCycleTime: 'no cycle time (event-driven or unknown)'
};

export function busLoadRows(response: BusLoadResponse): {
	counted: CountedFrameRow[];
	uncounted: UncountedFrameRow[];
} {
	const counted: CountedFrameRow[] = [];
	const uncounted: UncountedFrameRow[] = [];
	for (const load of response.busLoad.frames) {
		const frame = response.frames[load.frameIndex];
		const idText = formatCanId(load.id, frame?.extended ?? false);
		if (load.excluded !== null || frame?.cycleMs == null) {
			uncounted.push({
				frameIndex: load.frameIndex,
				name: load.name,
				idText,
				reason: EXCLUSION_REASONS[load.excluded ?? 'noCycleTime']
			});
			continue;
		}
		const {
			frameIndex,
			name,
			framesPerSecond,
			nominalBitsPerSecond,
			worstCaseBitsPerSecond,
			nominalPercent,
			worstCasePercent
		} = load;
		counted.push({
			frameIndex,
			name,
			idText,
			cycleMs: frame.cycleMs,
			framesPerSecond,
			nominalBitsPerSecond,
			worstCaseBitsPerSecond,
			nominalPercent,
			worstCasePercent
		});
	}
	// Heaviest first; equal loads in map order so the table does not shuffle between loads.
	counted.sort(
		(a, b) =>
			b.worstCaseBitsPerSecond - a.worstCaseBitsPerSecond ||
			b.nominalBitsPerSecond - a.nominalBitsPerSecond ||
			a.frameIndex - b.frameIndex
	);
	return { counted, uncounted };
}

/**
 * Worst-case budget default: 50 % of the bit rate. Common practice (from memory): planners keep
 * the scheduled load well under full so error frames, retransmissions, event frames and later
 * additions still fit; teams pick their own figure.
 */
export const DEFAULT_BUDGET_PERCENT = 50;

export const budgetSchema = z
	.string()
	.trim()
	.regex(/^\d+(\.\d+)?$/, 'The budget must be a plain number of percent, like 50.')
	.transform(Number)
	.pipe(
		z
			.number()
			.gt(0, 'The budget must be more than 0 %.')
			.max(100, 'The budget cannot exceed 100 % of the bus.')
	);
