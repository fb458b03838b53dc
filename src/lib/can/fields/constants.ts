/**
 * Constant bits: a bit that holds one value in every analysed frame. Reported per byte — the whole
 * byte when all eight bits are constant, otherwise each run of constant bits inside the byte —
 * because where a constant field ends cannot be seen from its bits.
 */
import { isConstantBit, type BitStatistics, type FrameSet } from './bit-statistics';
import type { ConstantProposal } from './proposal';
import { round4, wilsonLower } from './statistics';

/** `eligible[bit]` = 1 for the bits to consider. */
export function findConstants(
	set: FrameSet,
	stats: BitStatistics,
	eligible: Uint8Array,
	muxValue: number | null
): ConstantProposal[] {
	const found: ConstantProposal[] = [];
	const confidence = round4(wilsonLower(set.count, set.count));
	const where = muxValue === null ? '' : ` of page ${muxValue}`;
	for (let b = 0; b < set.length; b++) {
		let j = 0;
		while (j < 8) {
			const bit = b * 8 + j;
			if (!eligible[bit] || !isConstantBit(stats, bit)) {
				j++;
				continue;
			}
			let end = j + 1;
			while (end < 8 && eligible[b * 8 + end] && isConstantBit(stats, b * 8 + end)) end++;
			const value = (set.bytes[b] >> j) & ((1 << (end - j)) - 1);
			const length = end - j;
			found.push({
				kind: 'constant',
				startBit: bit,
				length,
				byteOrder: 'little',
				confidence,
				muxValue,
				evidence: `${length === 8 ? 'byte' : `${length} bit(s)`} equal to ${value} in all ${set.count} frames${where}`,
				value
			});
			j = end;
		}
	}
	return found;
}
