/**
 * Changes to a map's draft. Every change names the draft version it was made on (optimistic
 * concurrency): a draft changed by someone else in the meantime is refused with a 409, never
 * overwritten. Each change is audited in the same transaction.
 */
import type { DraftSavedResponse, RenamedMapResponse, VersionResponse } from '../../api/maps';
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
		if (current.version !== input.version) throw staleDraft(current);
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
