/**
 * Field-by-field differences between two snapshots of a receiver profile (revisions or the
 * draft): profile fields and the map revision linked to, wanted channels matched by name (ignoring
 * case, as names are unique that way), links matched by their wanted channel, and device alert
 * rules matched by id. mathjs-free: only data is compared.
 */
import { z } from 'zod';
import {
	alertRuleDiffSchema,
	diffAlertRules,
	diffItems,
	fieldChanges,
	fieldChangeSchema,
	itemDiffSchema,
	type ItemDiff
} from '../map-diff';
import type { Link } from './link-schema';
import type { ReceiverProfile } from './profile';

/** A profile as one revision (or the draft) has it, with the map revision its links point at. */
export interface ProfileSnapshot {
	profile: ReceiverProfile;
	links: readonly Link[];
	/** "Club racer engine controller r2", or null when not linked. */
	linkedTo: string | null;
}

export const profileDiffSchema = z.object({
	/** Profile-level fields (name, kind, notes) and `linkedTo`. */
	changes: z.array(fieldChangeSchema),
	/** Wanted channels matched by name; only those that differ. */
	wanted: z.array(itemDiffSchema),
	/** Links matched by their wanted channel; only those that differ. */
	links: z.array(itemDiffSchema),
	alertRules: z.array(alertRuleDiffSchema),
	/** True when nothing at all differs. */
	identical: z.boolean()
});
export type ProfileDiff = z.infer<typeof profileDiffSchema>;

const WANTED_FIELDS = [
	'quantity',
	'unit',
	'min',
	'max',
	'decimals',
	'required',
	'fuel',
	'notes'
] as const;
// The score a link was chosen with is left out: it says how, not what, the device receives.
const LINK_FIELDS = ['frame', 'id', 'extended', 'signal', 'conversion', 'manual'] as const;

const strip = <T>(items: (ItemDiff & { item: T })[]): ItemDiff[] =>
	items.map(({ item: _item, ...diff }) => diff);

export function diffProfiles(a: ProfileSnapshot, b: ProfileSnapshot): ProfileDiff {
	const head = (s: ProfileSnapshot) => ({
		name: s.profile.name,
		kind: s.profile.kind,
		notes: s.profile.notes,
		linkedTo: s.linkedTo
	});
	const changes = fieldChanges(head(a), head(b), ['name', 'kind', 'notes', 'linkedTo'] as const);
	const wanted = strip(
		diffItems(
			a.profile.wanted,
			b.profile.wanted,
			(w) => w.name.toLowerCase(),
			WANTED_FIELDS,
			(w) => w.name
		)
	);
	const links = strip(
		diffItems(
			a.links,
			b.links,
			(l) => l.wanted.toLowerCase(),
			LINK_FIELDS,
			(l) => l.wanted
		)
	);
	const alertRules = diffAlertRules(a.profile.alertRules, b.profile.alertRules);
	return {
		changes,
		wanted,
		links,
		alertRules,
		identical: changes.length + wanted.length + links.length + alertRules.length === 0
	};
}
