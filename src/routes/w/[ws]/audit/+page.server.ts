import { auditQuerySchema } from '$lib/api/workspaces';
import { queryObject } from '$lib/server/api';
import { fieldErrors } from '$lib/server/forms';
import { issuesOf } from '$lib/server/problem';
import { requireRole } from '$lib/server/guard';
import { auditPeople, readAuditLog } from '$lib/server/workspaces/audit-log';
import { AUDIT_KINDS, describeEntry, entryTime } from './describe.server';
import type { PageServerLoad } from './$types';

// Owners only. The filter is a plain GET form: a refused field is shown next to it, with no entries.
export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'owner');
	const { db } = event.locals.services;
	const sent = queryObject(event.url);
	// Shown again in the filter's fields; a URL can carry more than a field ever needs.
	const filter = Object.fromEntries(Object.entries(sent).map(([k, v]) => [k, v.slice(0, 200)]));
	const query = auditQuerySchema.safeParse(sent);
	const people = await auditPeople(db, workspace.id);
	if (!query.success) {
		const { errors } = fieldErrors(issuesOf(query.error));
		return { kinds: AUDIT_KINDS, people, filter, errors, entries: [], older: null, newer: null };
	}
	const { entries, older, newer } = await readAuditLog(db, workspace.id, query.data);
	return {
		kinds: AUDIT_KINDS,
		people,
		filter,
		errors: {} as Record<string, string[]>,
		entries: entries.map((entry) => ({
			id: entry.id,
			action: entry.action,
			at: entry.createdAt,
			when: entryTime(entry.createdAt),
			text: describeEntry(entry),
			note:
				entry.action === 'map.publish' && typeof entry.details.note === 'string'
					? entry.details.note.slice(0, 500)
					: null
		})),
		older,
		newer
	};
}) satisfies PageServerLoad;
