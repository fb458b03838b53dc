/**
 * Changes to a map's draft. Every change names the draft version it was made on (optimistic
 * concurrency): a draft changed by someone else in the meantime is refused with a 409, never
 * overwritten. Each change is audited in the same transaction. The protocol is shared with
 * receiver profiles (`../versioning/drafts.ts`); this module says how a map's draft is stored.
 */
import type { DraftSavedResponse, RenamedMapResponse } from '../../api/maps';
import { lintMap } from '../../can/lint';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import type { DB } from '../db/connection';
import { replaceDraft as replaceVersionedDraft, type DraftStore } from '../versioning/drafts';
import { requireMap, type MapRecord } from './maps';

/** How maps keep their draft: the JSON text and the version in the `maps` row. */
export const mapDrafts: DraftStore<MapRecord, CanMap> = {
	noun: 'map',
	require: requireMap,
	async write(db, change) {
		const result = await db
			.updateTable('maps')
			.set({
				name: change.draft.name,
				draft_json: serializeMap(change.draft),
				draft_version: change.next,
				updated_by: change.actorId,
				updated_at: change.at
			})
			.where('id', '=', change.id)
			.where('draft_version', '=', change.expected)
			.executeTakeFirst();
		return Number(result.numUpdatedRows) === 1;
	}
};

/** Replaces the draft only if nobody changed it since `version` was read (versioning/drafts.ts). */
export function replaceDraft(
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
	const { mapId, ...rest } = input;
	return replaceVersionedDraft(db, mapDrafts, { ...rest, id: mapId });
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
