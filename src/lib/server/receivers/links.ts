/**
 * Links between a profile and a map revision, on the server where the units library lives:
 * candidates and automatic links for a working copy, a link made by hand, and the check every
 * stored draft passes (each link names a signal the revision has, with the conversion its units
 * need). Nothing here stores anything.
 */
import type {
	LinkSuggestionsResponse,
	ProfileDraft,
	ManualLinkResponse,
	ProfileTarget
} from '../../api/receivers';
import type { Issue } from '../../api/problem';
import type { CanMap } from '../../can/map';
import { formatCanId } from '../../can/map-json';
import { describeConversion, type Conversion } from '../../can/receivers/conversion';
import {
	findMapSignal,
	linkProfile,
	rankCandidates,
	resolveManualLink,
	scoreCandidate,
	type Candidate,
	type Link
} from '../../can/receivers/linking';
import { createNameMatcher, mergeSynonyms, type NameMatcher } from '../../can/receivers/names';
import { findWanted, type ReceiverProfile, type WantedChannel } from '../../can/receivers/profile';
import type { DB } from '../db/connection';
import { requireMap } from '../maps/maps';
import { requireRevision } from '../maps/revisions';
import { Problem } from '../problem';
import { requireProfile } from './profiles';
import { workspaceSynonyms } from './synonyms';

export interface TargetMap {
	mapId: string;
	mapName: string;
	revision: number;
	map: CanMap;
}

/** Names compared with the built-in synonyms and the workspace's own. */
export async function workspaceMatcher(db: DB, workspaceId: string): Promise<NameMatcher> {
	return createNameMatcher(mergeSynonyms(await workspaceSynonyms(db, workspaceId)));
}

/** The map revision a target names, in this workspace. */
export async function loadTarget(
	db: DB,
	workspaceId: string,
	target: ProfileTarget
): Promise<TargetMap> {
	const record = await requireMap(db, workspaceId, target.mapId);
	const { map } = await requireRevision(db, record.id, target.revision);
	return { mapId: record.id, mapName: record.name, revision: target.revision, map };
}

/**
 * `loadTarget` for a request body: a map or revision that is not there is a field of the request
 * that was refused (400 naming `path`), not a missing page.
 */
export async function loadTargetOf(
	db: DB,
	workspaceId: string,
	target: ProfileTarget,
	path: string
): Promise<TargetMap> {
	try {
		return await loadTarget(db, workspaceId, target);
	} catch (error) {
		if (error instanceof Problem && error.status === 404)
			throw new Problem(400, 'The map revision to link to is not there.', [
				{ path, message: error.message }
			]);
		throw error;
	}
}

const sameConversion = (a: Conversion, b: Conversion) =>
	a.kind === b.kind &&
	a.from === b.from &&
	a.to === b.to &&
	a.form === b.form &&
	a.scale === b.scale &&
	a.offset === b.offset &&
	a.fuel === b.fuel;

/**
 * Why each link cannot be stored as it is, by path under `prefix` (e.g. `draft.links.2.signal`):
 * a frame or signal the revision does not have, a frame whose ID differs, units that do not
 * convert, or a conversion other than the one the units need now (a unit changed since linking).
 */
export function linkIssues(
	profile: ReceiverProfile,
	target: TargetMap,
	links: readonly Link[],
	prefix: string,
	matcher: NameMatcher
): Issue[] {
	const issues: Issue[] = [];
	const label = `r${target.revision} of "${target.mapName}"`;
	links.forEach((link, i) => {
		const at = (field: string) => `${prefix}.${i}.${field}`;
		const wanted = findWanted(profile, link.wanted);
		if (!wanted) return; // the draft schema names unknown wanted channels already
		const resolved = resolveManualLink(wanted, target.map, link, matcher);
		if (!resolved.ok) {
			const field = resolved.field === 'wanted' ? 'conversion' : resolved.field;
			issues.push({ path: at(field), message: `In ${label}: ${resolved.message}` });
			return;
		}
		const made = resolved.link;
		if (made.id !== link.id || made.extended !== link.extended || made.frame !== link.frame)
			issues.push({
				path: at('frame'),
				message: `In ${label}, ID ${formatCanId(made.id, made.extended)} is frame "${made.frame}", not "${link.frame}" with ID ${formatCanId(link.id, link.extended)}; link "${wanted.name}" again`
			});
		if (!sameConversion(made.conversion, link.conversion))
			issues.push({
				path: at('conversion'),
				message: `The link of "${wanted.name}" converts ${describeConversion(link.conversion)}, but ${made.frame} · ${made.signal} shown in ${wanted.unit || 'no unit'} needs ${describeConversion(made.conversion)}; link it again`
			});
	});
	return issues;
}

/** Candidates and automatic links for a working copy of a profile (links made by hand are kept). */
export async function suggestLinks(
	db: DB,
	input: {
		workspaceId: string;
		profileId: string;
		profile: ReceiverProfile;
		target: ProfileTarget;
		allowShared: boolean;
	}
): Promise<LinkSuggestionsResponse> {
	await requireProfile(db, input.workspaceId, input.profileId);
	const target = await loadTargetOf(db, input.workspaceId, input.target, 'target');
	const synonyms = await workspaceSynonyms(db, input.workspaceId);
	const report = linkProfile(input.profile, target.map, {
		synonyms,
		allowShared: input.allowShared
	});
	return { report };
}

/** A wanted channel linked by hand, or a 400 saying why it cannot be (at the field to change). */
export async function manualLink(
	db: DB,
	input: {
		workspaceId: string;
		profileId: string;
		wanted: WantedChannel;
		target: ProfileTarget;
		frame: string;
		signal: string;
	}
): Promise<ManualLinkResponse> {
	await requireProfile(db, input.workspaceId, input.profileId);
	const target = await loadTargetOf(db, input.workspaceId, input.target, 'target');
	const resolved = resolveManualLink(
		input.wanted,
		target.map,
		{ frame: input.frame, signal: input.signal },
		await workspaceMatcher(db, input.workspaceId)
	);
	if (!resolved.ok)
		throw new Problem(400, resolved.message, [
			{
				path: resolved.field === 'wanted' ? 'wanted.unit' : resolved.field,
				message: resolved.message
			}
		]);
	return { link: resolved.link, reason: resolved.reason };
}

/** Why each link of a draft was made, and the best candidates of each wanted channel without one. */
export interface LinkDetails {
	/** By wanted channel name: the name and unit reasoning of its link. */
	reasons: Record<string, string>;
	/** By wanted channel name: up to three candidates, best first, with score and reason. */
	candidates: Record<string, Candidate[]>;
}

/**
 * What the link table shows beside a stored draft (the reasons are not stored with the links):
 * computed again from the map revision, with the workspace's synonyms. Null when not linked.
 */
export async function linkDetails(
	db: DB,
	workspaceId: string,
	draft: ProfileDraft
): Promise<{ details: LinkDetails; map: CanMap } | null> {
	if (!draft.target) return null;
	const { map } = await loadTarget(db, workspaceId, draft.target);
	const matcher = await workspaceMatcher(db, workspaceId);
	const details: LinkDetails = { reasons: {}, candidates: {} };
	for (const wanted of draft.profile.wanted) {
		const link = draft.links.find((l) => l.wanted.toLowerCase() === wanted.name.toLowerCase());
		const found = link && findMapSignal(map, link);
		if (link && found)
			details.reasons[wanted.name] = link.manual
				? `linked by hand; ${describeConversion(link.conversion)}`
				: scoreCandidate(wanted, map, found.frameIndex, found.signalIndex, matcher).reason;
		else details.candidates[wanted.name] = rankCandidates(wanted, map, { matcher }).slice(0, 3);
	}
	return { details, map };
}
