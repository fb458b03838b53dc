/**
 * Changes to a map's draft. Every change names the draft version it was made on (optimistic
 * concurrency): a draft changed by someone else in the meantime is refused with a 409, never
 * overwritten. Each change is audited in the same transaction.
 */
import type { DraftSavedResponse, RenamedMapResponse } from '../../api/maps';
import { lintMap } from '../../can/lint';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import type { DB } from '../db/connection';
import { personLabel } from '../people';
import { Problem } from '../problem';
import { appendAudit } from '../workspaces/audit';
import { requireMap, type MapRecord } from './maps';

/**
 * Replaces the draft only if nobody changed it since `version` was read (optimistic concurrency):
 * the UPDATE names the version, so two racing saves cannot both succeed.
 */
export async function replaceDraft(
	db: DB,
	input: {
		workspaceId: string;
		mapId: string;
		version: number;
		draft: CanMap;
		actorId: string;
		action: string;
		details?: Record<string, unknown>;
	}
): Promise<{ version: number }> {
	return db.transaction().execute(async (trx) => {
		const current = await requireMap(trx, input.workspaceId, input.mapId);
		const next = input.version + 1;
		const result = await trx
			.updateTable('maps')
			.set({
				name: input.draft.name,
				draft_json: serializeMap(input.draft),
				draft_version: next,
				updated_by: input.actorId,
				updated_at: new Date().toISOString()
			})
			.where('id', '=', input.mapId)
			.where('draft_version', '=', input.version)
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) !== 1) throw staleDraft(current);
		await appendAudit(trx, {
			workspaceId: input.workspaceId,
			actorId: input.actorId,
			action: input.action,
			target: input.mapId,
			details: { version: next, ...input.details }
		});
		return { version: next };
	});
}

export function staleDraft(current: MapRecord): Problem {
	return new Problem(
		409,
		`This map was changed by ${personLabel(current.updatedBy)} at ${current.updatedAt} since you loaded it. Reload to see their changes; your edit was not saved.`,
		undefined,
		{ currentVersion: current.version, updatedAt: current.updatedAt, updatedBy: current.updatedBy }
	);
}

/** Saves the draft and answers with its lint problems: a draft may hold errors (work in progress); only publishing refuses them. */
export async function saveDraft(
	db: DB,
	input: { workspaceId: string; mapId: string; version: number; draft: CanMap; actorId: string }
): Promise<DraftSavedResponse> {
	const { version } = await replaceDraft(db, {
		...input,
		action: 'map.draft.save',
		details: { frames: input.draft.frames.length }
	});
	return { version, lint: lintMap(input.draft) };
}

/** Renaming changes the draft's name too, so the next revision carries it. */
export async function renameMap(
	db: DB,
	input: { workspaceId: string; mapId: string; version: number; name: string; actorId: string }
): Promise<RenamedMapResponse> {
	const current = await requireMap(db, input.workspaceId, input.mapId);
	const { version } = await replaceDraft(db, {
		...input,
		draft: { ...current.draft, name: input.name },
		action: 'map.rename',
		details: { from: current.name, to: input.name }
	});
	return { map: { id: current.id, name: input.name }, version };
}
