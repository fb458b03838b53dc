/**
 * Edits of a profile's working copy that must keep its parts in step: a wanted channel's name is
 * also its links' and alert rules' reference, a link made by hand is also an entry of
 * `manualLinks`, and automatic links replace only the links nobody made by hand. Pure functions
 * of the draft, so the editor and its tests share them.
 */
import type { ProfileDraft } from '$lib/api/receivers';
import type { Link, LinkReport } from '$lib/can/receivers/linking';
import type { WantedChannel } from '$lib/can/receivers/profile';

const same = (a: string, b: string) => a.toLowerCase() === b.toLowerCase();

/** The link of a wanted channel, if it has one. */
export function linkOf(draft: ProfileDraft, wanted: string): Link | undefined {
	return draft.links.find((l) => same(l.wanted, wanted));
}

/** Sets (or replaces) the link of its wanted channel; a link made by hand is kept in manualLinks too. */
export function setLink(draft: ProfileDraft, link: Link): ProfileDraft {
	const others = draft.profile.manualLinks.filter((m) => !same(m.wanted, link.wanted));
	return {
		...draft,
		profile: {
			...draft.profile,
			manualLinks: link.manual
				? [...others, { wanted: link.wanted, frame: link.frame, signal: link.signal }]
				: others
		},
		links: [...draft.links.filter((l) => !same(l.wanted, link.wanted)), link]
	};
}

/** Removes a wanted channel's link (and its entry in manualLinks). */
export function unlink(draft: ProfileDraft, wanted: string): ProfileDraft {
	return {
		...draft,
		profile: {
			...draft.profile,
			manualLinks: draft.profile.manualLinks.filter((m) => !same(m.wanted, wanted))
		},
		links: draft.links.filter((l) => !same(l.wanted, wanted))
	};
}

/** The links of an automatic linking run (it kept the links made by hand that still resolve). */
export function applyReport(draft: ProfileDraft, report: LinkReport): ProfileDraft {
	return { ...draft, links: report.links.map((l) => l.link) };
}

/**
 * Points the draft at another map revision. Links belong to one revision, so they go; links made by
 * hand stay in manualLinks, and automatic linking on the new revision makes them again.
 */
export function retarget(draft: ProfileDraft, target: ProfileDraft['target']): ProfileDraft {
	return { ...draft, target, links: [] };
}

/**
 * Replaces wanted channel `index`. A new name is carried into its link, its manual link and the
 * alert rules that watch it, so nothing points at the old name.
 */
export function editWanted(draft: ProfileDraft, index: number, next: WantedChannel): ProfileDraft {
	const before = draft.profile.wanted[index];
	const renamed = (name: string) => (same(name, before.name) ? next.name : name);
	return {
		...draft,
		profile: {
			...draft.profile,
			wanted: draft.profile.wanted.map((w, i) => (i === index ? next : w)),
			manualLinks: draft.profile.manualLinks.map((m) => ({ ...m, wanted: renamed(m.wanted) })),
			alertRules: draft.profile.alertRules.map((r) => ({ ...r, channel: renamed(r.channel) }))
		},
		links: draft.links.map((l) => ({ ...l, wanted: renamed(l.wanted) }))
	};
}

/** Removes wanted channel `index` with its link, its manual link and the alert rules on it. */
export function removeWanted(draft: ProfileDraft, index: number): ProfileDraft {
	const gone = draft.profile.wanted[index];
	const unlinked = unlink(draft, gone.name);
	return {
		...unlinked,
		profile: {
			...unlinked.profile,
			wanted: unlinked.profile.wanted.filter((_, i) => i !== index),
			alertRules: unlinked.profile.alertRules.filter((r) => !same(r.channel, gone.name))
		}
	};
}

/** A new wanted channel with a name no other has (a count, shown without unit, until edited). */
export function newWanted(draft: ProfileDraft): WantedChannel {
	let n = draft.profile.wanted.length + 1;
	while (draft.profile.wanted.some((w) => same(w.name, `Channel ${n}`))) n++;
	return {
		name: `Channel ${n}`,
		quantity: 'count',
		unit: '',
		min: null,
		max: null,
		decimals: 0,
		required: false,
		fuel: null,
		notes: ''
	};
}

/** Whether a change of this channel changes what its link must convert to (so it is resolved again). */
export function changesConversion(before: WantedChannel, after: WantedChannel): boolean {
	return (
		before.unit !== after.unit || before.quantity !== after.quantity || before.fuel !== after.fuel
	);
}
