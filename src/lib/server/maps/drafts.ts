/**
 * Changes to a map's draft. Every change names the draft version it was made on (optimistic
 * concurrency): a draft changed by someone else in the meantime is refused with a 409, never
 * overwritten. Each change is audited in the same transaction. The protocol is shared with
 * receiver profiles (`../versioning/drafts.ts`); this module says how a map's draft is stored.
 */
import type { DraftSavedResponse, RenamedMapResponse, VersionResponse } from '../../api/maps';
import { lintMap } from '../../can/lint';
import type { CanMap } from '../../can/map';
import { serializeMap } from '../../can/map-json';
import type { DB } from '../db/connection';
import {
	replaceDraft as replaceVersionedDraft,
	staleDraft,
	type DraftStore
} from '../versioning/drafts';
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

/**
 * Sets one of the map's settings in the draft, as a draft change of its own (versioned, audited
 * with the old and new value); other unsaved edits in a browser stay unsaved.
 */
async function changeSetting<K extends 'name' | 'bitrate'>(
	db: DB,
	input: { workspaceId: string; mapId: string; version: number; actorId: string },
	setting: { field: K; value: CanMap[K]; action: string }
): Promise<{ current: MapRecord; version: number }> {
	const current = await requireMap(db, input.workspaceId, input.mapId);
	// Setting the value it already has changes nothing (no new version, no audit entry) — as long
	// as the caller's copy is current: a stale one must still learn that it is.
	if (current.draft[setting.field] === setting.value) {
		if (current.version !== input.version) throw staleDraft(mapDrafts.noun, current);
		return { current, version: current.version };
	}
	const { version } = await replaceDraft(db, {
		...input,
		draft: { ...current.draft, [setting.field]: setting.value },
		action: setting.action,
		details: { from: current.draft[setting.field], to: setting.value }
	});
	return { current, version };
}

/** Renaming changes the draft's name too, so the next revision carries it. */
export async function renameMap(
	db: DB,
	input: { workspaceId: string; mapId: string; version: number; name: string; actorId: string }
): Promise<RenamedMapResponse> {
	const { current, version } = await changeSetting(db, input, {
		field: 'name',
		value: input.name,
		action: 'map.rename'
	});
	return { map: { id: current.id, name: input.name }, version };
}

/** The bus's bit rate, which every node must share (a map setting kept in the draft). */
export async function setMapBitrate(
	db: DB,
	input: { workspaceId: string; mapId: string; version: number; bitrate: number; actorId: string }
): Promise<VersionResponse> {
	const { version } = await changeSetting(db, input, {
		field: 'bitrate',
		value: input.bitrate,
		action: 'map.bitrate'
	});
	return { version };
}
