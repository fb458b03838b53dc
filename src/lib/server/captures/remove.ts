/**
 * Deleting a capture (owners delete any, others only their own uploads) or every capture of a
 * workspace being deleted: the rows go first, then every object under the capture's (or the
 * workspace's) storage folder — upload, chunked store, stored decodes — so nothing is left orphaned.
 */
import { appendAudit } from '../workspaces/audit';
import { Problem } from '../problem';
import type { Role } from '../../roles';
import type { Services } from '../services';
import { deleteCaptureRow, requireCaptureRow } from './captures-db';
import { captureKeys, workspaceCaptureFolder } from './capture-store';
import { forgetCaptureDecodes } from './decoding';
import { processingDone, stopWorkspaceProcessing } from './processing';

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
	forgetCaptureDecodes(row.id);
	await services.storage.deletePrefix(captureKeys(row.workspace_id, row.id).folder);
	// An upload stored outside the capture's folder (none today) goes too.
	await services.storage.delete(row.raw_key);
}

/**
 * The storage side of deleting a workspace, after its rows are gone: processing of its captures is
 * stopped (what it wrote is discarded) and every object under the workspace's folder is removed.
 */
export async function deleteWorkspaceCaptures(
	services: Pick<Services, 'storage'>,
	workspaceId: string
): Promise<void> {
	await stopWorkspaceProcessing(workspaceId);
	await services.storage.deletePrefix(workspaceCaptureFolder(workspaceId));
}
