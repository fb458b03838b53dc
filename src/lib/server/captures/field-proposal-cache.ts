/**
 * What this server thread keeps of field proposals and correlations (field-proposals.ts), bounded
 * by the size of their JSON. Keys start with the capture's store key, so a capture's entries go
 * when it is deleted or processed again (forgetCaptureDecodes calls forgetFieldProposals).
 */
import { LRUCache } from 'lru-cache';
import type { CorrelateResponse } from '../../api/field-proposals';
import type { IdProposals } from '../../can/fields';

const MiB = 1024 * 1024;
const sized = <T extends object>(maxSize: number) =>
	new LRUCache<string, T>({
		maxSize,
		sizeCalculation: (v) => Math.max(1, JSON.stringify(v).length)
	});

/** Proposals per (store, ID). */
export const proposals = sized<IdProposals>(16 * MiB);
/** Correlations per (store, decode, channel, points). */
export const correlations = sized<CorrelateResponse>(16 * MiB);

/** Forgets the cached answers of a capture. */
export function forgetFieldProposals(captureId: string): void {
	for (const cache of [proposals, correlations] as LRUCache<string, object>[])
		for (const key of [...cache.keys()]) if (key.includes(`/${captureId}/`)) cache.delete(key);
}
