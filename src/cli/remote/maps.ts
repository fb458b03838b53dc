/** Naming maps and revisions on the command line against a server. */
import { z } from 'zod';
import type { MapSummary } from '../../lib/api/maps';
import { InputError } from '../errors';
import { remoteError, type Remote } from './connection';

/** `--revision`: a number (`3` or `r3`), `latest` (the newest published) or `draft`. */
export type RevisionChoice = number | 'latest' | 'draft';

export const revisionOption = z
	.string()
	.trim()
	.toLowerCase()
	.regex(
		/^(latest|draft|r?[1-9]\d{0,8})$/,
		'must be a revision number like 3 (or r3), "latest" or "draft"'
	)
	.transform((s): RevisionChoice =>
		s === 'latest' || s === 'draft' ? s : Number(s.replace(/^r/, ''))
	);

/** `--map` against a server: a map's id, or its name (any case) when exactly one map has it. */
export const mapNameOption = z
	.string({ error: '--map NAME is required (the map’s name or id)' })
	.trim()
	.min(1, '--map needs the map’s name or id');

export async function findMap(remote: Remote, nameOrId: string): Promise<MapSummary> {
	let maps: MapSummary[];
	try {
		({ maps } = await remote.api('maps.list'));
	} catch (error) {
		throw remoteError(error, remote.server);
	}
	const byId = maps.find((m) => m.id === nameOrId);
	if (byId) return byId;
	const wanted = nameOrId.toLowerCase();
	const byName = maps.filter((m) => m.name.toLowerCase() === wanted);
	if (byName.length === 1) return byName[0];
	const names = maps.map((m) => `"${m.name}"`).join(', ') || 'none';
	if (byName.length > 1)
		throw new InputError(
			`${byName.length} maps in ${remote.workspace.name} are called "${nameOrId}"; give its id instead (${byName.map((m) => m.id).join(', ')})`
		);
	throw new InputError(`no map "${nameOrId}" in ${remote.workspace.name} (maps: ${names})`);
}

/** A revision choice made concrete: `latest` becomes the newest published revision's number. */
export function concreteRevision(map: MapSummary, choice: RevisionChoice): number | 'draft' {
	if (choice !== 'latest') return choice;
	if (map.latestRevision === null)
		throw new InputError(
			`"${map.name}" has no published revision yet; use --revision draft for its draft`
		);
	return map.latestRevision;
}

export const revisionLabelOf = (ref: number | 'draft') => (ref === 'draft' ? 'draft' : `r${ref}`);
