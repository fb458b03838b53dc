/**
 * A capture's own bit rate (docs/capture-csv.md, "Bit rate"): bus load and frame timing use the
 * bus the capture was recorded on, not whichever map decodes it. Null until the first decode
 * guesses it from that decode's map; a person can set it (and the CAN FD data-phase rate) on the
 * capture page. Until then the views use the workspace's usual map bit rate and say so.
 */
import type { CaptureBitrate } from '../../api/captures';
import type { DB } from '../db/connection';
import type { CaptureRow } from '../db/schema';

/** A map's default bit rate (the map format's default) when a workspace has no map yet. */
const FALLBACK_BITRATE = 500_000;

/** The bit rate most of the workspace's maps use (their drafts), or the map format's default. */
async function usualMapBitrate(db: DB, workspaceId: string): Promise<number> {
	const maps = await db
		.selectFrom('maps')
		.select('draft_json')
		.where('workspace_id', '=', workspaceId)
		.orderBy('name')
		.execute();
	const counts = new Map<number, number>();
	for (const m of maps) {
		const rate = (JSON.parse(m.draft_json) as { bitrate?: unknown }).bitrate;
		if (typeof rate === 'number') counts.set(rate, (counts.get(rate) ?? 0) + 1);
	}
	let best = FALLBACK_BITRATE;
	let most = 0;
	for (const [rate, n] of counts) if (n > most) [best, most] = [rate, n];
	return best;
}

/** The bit rate a capture's bus load and timing use, and where it comes from. */
export async function captureBitrate(
	db: DB,
	row: Pick<CaptureRow, 'workspace_id' | 'bitrate' | 'data_bitrate' | 'bitrate_guess'>
): Promise<CaptureBitrate> {
	if (row.bitrate === null)
		return {
			bitrate: await usualMapBitrate(db, row.workspace_id),
			dataBitrate: null,
			source: { kind: 'workspace' }
		};
	return {
		bitrate: row.bitrate,
		dataBitrate: row.data_bitrate,
		source:
			row.bitrate_guess === null ? { kind: 'set' } : { kind: 'map', mapName: row.bitrate_guess }
	};
}

/** At a decode: a capture without a bit rate takes its map's (only if none was guessed or set yet). */
export async function guessBitrateFromMap(
	db: DB,
	captureId: string,
	map: { name: string; bitrate: number }
): Promise<void> {
	await db
		.updateTable('captures')
		.set({ bitrate: map.bitrate, data_bitrate: null, bitrate_guess: map.name })
		.where('id', '=', captureId)
		.where('bitrate', 'is', null)
		.execute();
}
