/**
 * Moving a profile's draft to a newer revision of its map: the review (what each link keeps,
 * changes or breaks there, with the likeliest new name of a vanished signal) and, after review,
 * the move in one versioned, audited step. A broken link is dropped unless the person takes its
 * suggestion; links made by hand follow their signal (and leave `manualLinks` when dropped).
 */
import type { ProfileDraft, RelinkedResponse, RelinkReview } from '../../api/receivers';
import type { CanMap } from '../../can/map';
import type { Link } from '../../can/receivers/linking';
import type { ManualLink } from '../../can/receivers/profile';
import { relinkProfile, type RelinkResult } from '../../can/receivers/relink';
import type { DB } from '../db/connection';
import { requireMap } from '../maps/maps';
import { listRevisions, requireRevision } from '../maps/revisions';
import { Problem } from '../problem';
import { replaceDraft } from '../versioning/drafts';
import { profileDrafts } from './drafts';
import { requireProfile, type ProfileRecord } from './profiles';
import { workspaceSynonyms } from './synonyms';

interface Review {
	record: ProfileRecord;
	mapId: string;
	mapName: string;
	from: number;
	to: number;
	newer: number[];
	result: RelinkResult;
}

async function review(
	db: DB,
	workspaceId: string,
	profileId: string,
	to: number | undefined
): Promise<Review> {
	const record = await requireProfile(db, workspaceId, profileId);
	const target = record.draft.target;
	if (!target)
		throw new Problem(
			409,
			record.mapDeleted
				? 'The map this profile was linked to has been deleted; link the profile to another map.'
				: 'This profile is not linked to a map revision yet, so there is nothing to relink.'
		);
	const map = await requireMap(db, workspaceId, target.mapId);
	const revisions = (await listRevisions(db, map.id)).map((r) => r.number);
	const newer = revisions.filter((n) => n > target.revision);
	const goal = to ?? revisions[0];
	const revisionAt = async (n: number): Promise<CanMap> =>
		(await requireRevision(db, map.id, n)).map;
	const [mapA, mapB] = await Promise.all([revisionAt(target.revision), revisionAt(goal)]);
	const result = relinkProfile(record.draft.profile, record.draft.links, mapA, mapB, {
		synonyms: await workspaceSynonyms(db, workspaceId)
	});
	return {
		record,
		mapId: map.id,
		mapName: map.name,
		from: target.revision,
		to: goal,
		newer,
		result
	};
}

/** What moving the draft's links to revision `to` (the map's latest by default) keeps, changes and breaks. */
export async function relinkReview(
	db: DB,
	workspaceId: string,
	profileId: string,
	to?: number
): Promise<RelinkReview> {
	const r = await review(db, workspaceId, profileId, to);
	return {
		map: { id: r.mapId, name: r.mapName },
		from: r.from,
		to: r.to,
		newer: r.newer,
		result: r.result
	};
}

/** The draft as it is on the new revision: kept and changed links moved, accepted suggestions taken. */
function relinkedDraft(
	r: Review,
	accept: ReadonlySet<string>
): { draft: ProfileDraft; accepted: number; dropped: number } {
	const links: Link[] = [];
	let manualLinks: ManualLink[] = [...r.record.draft.profile.manualLinks];
	const follow = (wanted: string, to: { frame: string; signal: string } | null) => {
		const key = wanted.toLowerCase();
		manualLinks = manualLinks.flatMap((m) =>
			m.wanted.toLowerCase() !== key
				? [m]
				: to
					? [{ ...m, frame: to.frame, signal: to.signal }]
					: []
		);
	};
	let accepted = 0;
	let dropped = 0;
	for (const item of r.result.items) {
		if (item.after) {
			links.push(item.after);
			if (item.before.manual) follow(item.wanted, item.after);
			continue;
		}
		const suggestion = item.suggestion;
		if (suggestion && accept.has(item.wanted.toLowerCase())) {
			const link: Link = {
				wanted: item.before.wanted,
				frame: suggestion.frame,
				id: suggestion.id,
				extended: suggestion.extended,
				signal: suggestion.signal,
				conversion: suggestion.conversion!,
				confidence: item.before.manual ? 1 : suggestion.score,
				manual: item.before.manual
			};
			links.push(link);
			if (link.manual) follow(item.wanted, link);
			accepted++;
		} else {
			if (item.before.manual) follow(item.wanted, null);
			dropped++;
		}
	}
	return {
		draft: {
			profile: { ...r.record.draft.profile, manualLinks },
			target: { mapId: r.mapId, revision: r.to },
			links
		},
		accepted,
		dropped
	};
}

/**
 * Moves the draft to map revision `revision` in one step, as reviewed: the person names the draft
 * version they reviewed (409 when it moved on) and the broken links whose suggestion they take.
 */
export async function applyRelink(
	db: DB,
	input: {
		workspaceId: string;
		profileId: string;
		version: number;
		revision: number;
		accept: readonly string[];
		actorId: string;
	}
): Promise<RelinkedResponse> {
	const r = await review(db, input.workspaceId, input.profileId, input.revision);
	if (r.to <= r.from)
		throw new Problem(
			400,
			`The profile is linked to r${r.from} already; choose a newer revision.`,
			[{ path: 'revision', message: `choose a revision after r${r.from}` }]
		);
	const takeable = new Set(
		r.result.items
			.filter((i) => i.status === 'broken' && i.suggestion)
			.map((i) => i.wanted.toLowerCase())
	);
	const issues = input.accept.flatMap((name, i) =>
		takeable.has(name.toLowerCase())
			? []
			: [
					{
						path: `accept.${i}`,
						message: `"${name}" has no suggested signal to take on r${r.to} (only a broken link with a suggestion can take one)`
					}
				]
	);
	if (issues.length > 0) throw new Problem(400, 'Some suggestions cannot be taken.', issues);
	const { draft, accepted, dropped } = relinkedDraft(
		r,
		new Set(input.accept.map((a) => a.toLowerCase()))
	);
	const { version } = await replaceDraft(db, profileDrafts, {
		workspaceId: input.workspaceId,
		id: input.profileId,
		version: input.version,
		draft,
		actorId: input.actorId,
		action: 'receiver.relink',
		details: {
			map: r.mapId,
			from: r.from,
			to: r.to,
			kept: r.result.counts.kept,
			changed: r.result.counts.changed,
			broken: r.result.counts.broken,
			accepted,
			dropped
		}
	});
	return {
		version,
		revision: r.to,
		kept: r.result.counts.kept,
		changed: r.result.counts.changed,
		accepted,
		dropped
	};
}
