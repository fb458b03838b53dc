/**
 * Saved views of a capture's workbench: a name and the view state. Everyone who may read the
 * capture sees them; each person saves their own (saving under a name they used already replaces
 * that view), and deletes their own — an owner may delete any.
 */
import {
	workbenchStateSchema,
	type SaveViewInput,
	type SavedView,
	type SavedViewList
} from '../../api/workbench';
import type { Role } from '../../roles';
import type { DB } from '../db/connection';
import { personRef } from '../people';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';
import { requireCaptureRow } from './captures-db';

/** Views a capture may have, so a script cannot fill the table. */
export const MAX_VIEWS_PER_CAPTURE = 200;

interface Asker {
	id: string;
	role: Role;
}

function viewQuery(db: DB, captureId: string) {
	return db
		.selectFrom('capture_views')
		.leftJoin('User', 'User.id', 'capture_views.saved_by')
		.selectAll('capture_views')
		.select(['User.email as saverEmail', 'User.name as saverName'])
		.where('capture_views.capture_id', '=', captureId);
}

type ViewJoined = Awaited<ReturnType<ReturnType<typeof viewQuery>['executeTakeFirstOrThrow']>>;

function toSavedView(row: ViewJoined, asker: Asker): SavedView {
	// A state saved by an older version that no longer reads opens as the default view, never an error.
	const parsed = workbenchStateSchema.safeParse(JSON.parse(row.state_json));
	return {
		id: row.id,
		name: row.name,
		state: parsed.success ? parsed.data : workbenchStateSchema.parse({}),
		savedBy: personRef(row.saverEmail, row.saverName),
		savedAt: row.saved_at,
		canDelete: asker.role === 'owner' || row.saved_by === asker.id
	};
}

export async function listSavedViews(
	db: DB,
	workspaceId: string,
	captureId: string,
	asker: Asker
): Promise<SavedViewList> {
	await requireCaptureRow(db, workspaceId, captureId);
	const rows = await viewQuery(db, captureId)
		.orderBy('capture_views.name')
		.orderBy('capture_views.saved_at')
		.execute();
	return { views: rows.map((r) => toSavedView(r, asker)) };
}

export async function saveView(
	db: DB,
	input: { workspaceId: string; captureId: string; asker: Asker; view: SaveViewInput }
): Promise<SavedView> {
	const { workspaceId, captureId, asker } = input;
	const view = { name: input.view.name, state: workbenchStateSchema.parse(input.view.state) };
	await requireCaptureRow(db, workspaceId, captureId);
	const id = await db.transaction().execute(async (trx) => {
		const mine = await trx
			.selectFrom('capture_views')
			.select('id')
			.where('capture_id', '=', captureId)
			.where('saved_by', '=', asker.id)
			.where('name', '=', view.name)
			.executeTakeFirst();
		const savedAt = new Date().toISOString();
		let viewId: string;
		if (mine) {
			viewId = mine.id;
			await trx
				.updateTable('capture_views')
				.set({ state_json: JSON.stringify(view.state), saved_at: savedAt })
				.where('id', '=', viewId)
				.execute();
		} else {
			const { count } = await trx
				.selectFrom('capture_views')
				.select((eb) => eb.fn.countAll<number>().as('count'))
				.where('capture_id', '=', captureId)
				.executeTakeFirstOrThrow();
			if (Number(count) >= MAX_VIEWS_PER_CAPTURE)
				throw new Problem(
					409,
					`This capture has ${MAX_VIEWS_PER_CAPTURE} saved views already; delete some before saving more.`
				);
			viewId = crypto.randomUUID();
			await trx
				.insertInto('capture_views')
				.values({
					id: viewId,
					capture_id: captureId,
					name: view.name,
					state_json: JSON.stringify(view.state),
					saved_by: asker.id,
					saved_at: savedAt
				})
				.execute();
		}
		await appendAudit(trx, {
			workspaceId,
			actorId: asker.id,
			action: 'capture.view_save',
			target: captureId,
			details: { view: viewId, name: view.name, replaced: Boolean(mine) }
		});
		return viewId;
	});
	const row = await viewQuery(db, captureId)
		.where('capture_views.id', '=', id)
		.executeTakeFirstOrThrow();
	return toSavedView(row, asker);
}

export async function deleteSavedView(
	db: DB,
	input: { workspaceId: string; captureId: string; viewId: string; asker: Asker }
): Promise<void> {
	const { workspaceId, captureId, viewId, asker } = input;
	await requireCaptureRow(db, workspaceId, captureId);
	const row = await db
		.selectFrom('capture_views')
		.selectAll()
		.where('capture_id', '=', captureId)
		.where('id', '=', viewId)
		.executeTakeFirst();
	if (!row) throw new Problem(404, 'That saved view does not exist (it may have been deleted).');
	if (asker.role !== 'owner' && row.saved_by !== asker.id)
		throw new Problem(
			403,
			'Only the person who saved this view, or a workspace owner, can delete it.'
		);
	await db.transaction().execute(async (trx) => {
		await trx.deleteFrom('capture_views').where('id', '=', viewId).execute();
		await appendAudit(trx, {
			workspaceId,
			actorId: asker.id,
			action: 'capture.view_delete',
			target: captureId,
			details: { view: viewId, name: row.name }
		});
	});
}
