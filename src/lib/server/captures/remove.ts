/** Deleting a capture: owners delete any, others only their own uploads; its blobs go with it. */
import { appendAudit } from '../workspaces/audit';
import { Problem } from '../problem';
import type { Role } from '../../roles';
import type { Services } from '../services';
import { deleteCaptureRow, requireCaptureRow } from './captures-db';
import { forgetCaptureDecodes } from './decoding';
import { processingDone } from './processing';
import { captureKeys, forgetFrameStore } from './store';

export async function deleteCapture(
	services: Pick<Services, 'db' | 'storage'>,
	input: { workspaceId: string; captureId: string; actorId: string; role: Role }
): Promise<void> {
	const row = await requireCaptureRow(services.db, input.workspaceId, input.captureId);
	if (input.role !== 'owner' && row.uploaded_by !== input.actorId) {
		throw new Problem(
			403,
			'Only a workspace owner or the person who uploaded this capture can delete it.'
		);
	}
	if (row.status === 'processing')
		throw new Problem(409, 'This capture is being processed; delete it when processing has ended.');
	await processingDone(row.id);
	// The row first (with its decodes, by cascade): a blob left by a failed delete is unreachable, never a dangling row.
	await services.db.transaction().execute(async (trx) => {
		await deleteCaptureRow(trx, row.id);
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: 'capture.delete',
			target: row.id,
			details: { name: row.name }
		});
	});
	const keys = captureKeys(row.workspace_id, row.id);
	forgetFrameStore(row.store_key);
	forgetCaptureDecodes(services, row.id);
	for (const key of new Set([row.raw_key, keys.store, ...(row.store_key ? [row.store_key] : [])]))
		await services.storage.delete(key);
}
