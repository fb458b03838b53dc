/**
 * Editing a capture's bit rate and its bus load per bus at that rate (docs/capture-csv.md, "Bit
 * rate" and "Several buses"). The load is counted in a capture worker, never on the request thread.
 */
import type { CaptureBitrate, CaptureBitrateInput } from '../../api/captures';
import type { CaptureBusLoadResponse } from '../../api/capture-views';
import type { DB } from '../db/connection';
import type { Services } from '../services';
import { appendAudit } from '../workspaces/audit';
import { captureBitrate } from './bitrate';
import { byteCache } from './capture-store';
import { requireCaptureRow } from './captures-db';
import { captureIndexKey, requireReadyCapture } from './decoding';
import { runCaptureTask } from './pool';
import type { BusLoadOutcome, BusLoadTask } from './work/tasks';

/** Sets a capture's bit rates by hand (recorded in the audit log); answers the new setting. */
export async function setCaptureBitrate(
	db: DB,
	input: { workspaceId: string; captureId: string; actorId: string } & CaptureBitrateInput
): Promise<CaptureBitrate> {
	const row = await requireCaptureRow(db, input.workspaceId, input.captureId);
	await db.transaction().execute(async (trx) => {
		await trx
			.updateTable('captures')
			.set({ bitrate: input.bitrate, data_bitrate: input.dataBitrate, bitrate_guess: null })
			.where('id', '=', row.id)
			.execute();
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'capture.bitrate',
			target: row.id,
			details: {
				from: row.bitrate,
				to: input.bitrate,
				dataFrom: row.data_bitrate,
				dataTo: input.dataBitrate
			}
		});
	});
	return { bitrate: input.bitrate, dataBitrate: input.dataBitrate, source: { kind: 'set' } };
}

const loads = byteCache<BusLoadOutcome>(16 * 1024 * 1024, (o) =>
	o.buses.reduce((n, b) => n + 40 * b.windows.length + 200, 0)
);

/** Bus load per bus at the capture's bit rates, computed in a worker (kept per rate pair). */
export async function captureBusLoad(
	services: Services,
	workspaceId: string,
	captureId: string
): Promise<CaptureBusLoadResponse> {
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const bitrate = await captureBitrate(services.db, capture);
	const indexKey = await captureIndexKey(services, capture);
	const task: BusLoadTask = {
		kind: 'bus-load',
		storage: services.storage.settings,
		indexKey,
		bitrate: bitrate.bitrate,
		dataBitrate: bitrate.dataBitrate
	};
	// Keyed by when the store was written too: a capture processed again has a new store at the same key.
	const id = `${JSON.stringify(task.storage)}|${indexKey}|${capture.processed_at}|${task.bitrate}|${task.dataBitrate}`;
	const outcome = await loads.get(id, () => runCaptureTask<BusLoadOutcome>(task));
	return { bitrate, ...outcome };
}
