/**
 * Profile downloads and the install sheet: the receive set (`framewright-receive@1`, what the
 * device's setup needs per wanted channel, scale and offset composed with the unit conversion) and
 * the profile file (`framewright-profile@1`), each naming the profile revision (or draft) and the
 * map revision it was built from.
 */
import type { RevisionRef } from '../../api/maps';
import type { ReceiverExportFormat } from '../../api/receivers';
import {
	buildReceiveSet,
	serializeReceiveSet,
	type ReceiveSet
} from '../../can/receivers/receive-set';
import { serializeProfile, type DeviceAlertRule } from '../../can/receivers/profile';
import { slugPart } from '../../slug';
import type { DB } from '../db/connection';
import { Problem } from '../problem';
import { loadTarget } from './links';
import { loadProfileSnapshot, type ProfileSnapshot } from './revisions';

/** The receive set of a snapshot; 409 when it is not linked or a link no longer holds. */
async function receiveSetOf(
	db: DB,
	workspaceId: string,
	snapshot: ProfileSnapshot
): Promise<ReceiveSet> {
	const target = snapshot.draft.target;
	if (!target)
		throw new Problem(
			409,
			snapshot.mapDeleted
				? `The map the ${snapshot.label} of this profile was linked to has been deleted; link it to another map to build a receive set.`
				: `The ${snapshot.label} of this profile is not linked to a map revision yet; link it first.`
		);
	const { map } = await loadTarget(db, workspaceId, target);
	const built = buildReceiveSet(snapshot.draft.profile, map, snapshot.draft.links, {
		revision: target.revision
	});
	if (!built.ok)
		throw new Problem(
			409,
			`The links of the ${snapshot.label} no longer hold: ${built.problems.map((p) => p.message).join('; ')}`
		);
	return built.receiveSet;
}

/** `dash-display-r2.receive.json`: the profile's name and revision travel with the file. */
function fileName(profileName: string, label: string, format: ReceiverExportFormat): string {
	const base = `${slugPart(profileName, 'profile')}-${label}`;
	return format === 'receive-set' ? `${base}.receive.json` : `${base}.profile.json`;
}

export async function exportProfile(
	db: DB,
	workspaceId: string,
	profileId: string,
	query: { rev: RevisionRef; format: ReceiverExportFormat }
): Promise<Response> {
	const snapshot = await loadProfileSnapshot(db, workspaceId, profileId, query.rev);
	const { profile } = snapshot.draft;
	const body =
		query.format === 'receive-set'
			? serializeReceiveSet(await receiveSetOf(db, workspaceId, snapshot))
			: serializeProfile(profile);
	return new Response(body, {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="${fileName(profile.name, snapshot.label, query.format)}"`,
			'x-framewright-revision': snapshot.label,
			'cache-control': 'no-store'
		}
	});
}

export interface InstallSheet {
	label: string;
	profileName: string;
	kind: string;
	notes: string;
	publishedAt: string | null;
	note: string | null;
	receiveSet: ReceiveSet;
	alertRules: DeviceAlertRule[];
	/** What the person asked for, for the download links. */
	rev: RevisionRef;
}

/** Everything the printable install sheet shows, from the same receive set the download holds. */
export async function installSheet(
	db: DB,
	workspaceId: string,
	profileId: string,
	rev: RevisionRef
): Promise<InstallSheet> {
	const snapshot = await loadProfileSnapshot(db, workspaceId, profileId, rev);
	const { profile } = snapshot.draft;
	return {
		label: snapshot.label,
		profileName: profile.name,
		kind: profile.kind,
		notes: profile.notes,
		publishedAt: snapshot.revision?.publishedAt ?? null,
		note: snapshot.revision?.note ?? null,
		receiveSet: await receiveSetOf(db, workspaceId, snapshot),
		alertRules: profile.alertRules,
		rev
	};
}
