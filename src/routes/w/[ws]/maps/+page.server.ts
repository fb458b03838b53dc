import { redirect } from '@sveltejs/kit';
import { createMapInputSchema, type CreateMapInput } from '$lib/api/maps';
import type { WorkspaceAccess } from '$lib/server/access';
import { formAction, formFields, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { z } from 'zod';
import { parseMap } from '$lib/can/map-json';
import { saveDraft } from '$lib/server/maps/drafts';
import { importMap } from '$lib/server/maps/import';
import { listMaps, requireMap } from '$lib/server/maps/maps';
import { parseOrProblem, Problem } from '$lib/server/problem';
import { copyName, sameName } from './import-names';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return { maps: await listMaps(event.locals.services.db, workspace.id), role };
}) satisfies PageServerLoad;

/** The file fields of the two imports, named as in the JSON route's body. */
const IMPORT_FIELDS = ['mapJson', 'signalTableCsv'] as const;

async function importedFile(form: FormData): Promise<Record<string, string | number>> {
	for (const field of IMPORT_FIELDS) {
		const file = form.get(field);
		if (!(file instanceof File && file.size > 0)) continue;
		const text = await file.text();
		// A map file carries its own bit rate; the table's comes from the form.
		if (field === 'mapJson') return { mapJson: text };
		return { signalTableCsv: text, ...formFields(form, { bitrate: 'number' }) };
	}
	throw new Problem(400, 'Choose a map JSON file or a CSV signal table to import.');
}

/** What to do when an imported map file's name is already a map's (docs/map-format.md). */
const nameTakenSchema = z.enum(['ask', 'replace', 'copy']).catch('ask');

/** The new map opens in its editor. */
async function createAndOpen(
	event: RequestEvent,
	{ user, workspace }: WorkspaceAccess,
	request: CreateMapInput
): Promise<never> {
	const { map } = await importMap(event.locals.services.db, {
		workspaceId: workspace.id,
		actorId: user.id,
		request
	});
	redirect(303, `/w/${workspace.slug}/maps/${map.id}`);
}

export const actions = {
	create: formAction('create', async (event: RequestEvent, form) => {
		const access = await requireRole(event, 'editor');
		const request = readForm(form, createMapInputSchema, { name: 'text', bitrate: 'number' });
		return createAndOpen(event, access, request);
	}),

	// A bad file is refused whole, with every problem (line numbers for CSV rows); nothing is stored.
	import: formAction('import', async (event: RequestEvent, form) => {
		const access = await requireRole(event, 'editor');
		const request = parseOrProblem(createMapInputSchema, await importedFile(form));
		const parsed = request.mapJson === undefined ? null : parseMap(request.mapJson);
		if (!parsed?.ok) return createAndOpen(event, access, request);
		// A file named like an existing map would make a second map of that name: ask first.
		const { db } = event.locals.services;
		const maps = await listMaps(db, access.workspace.id);
		const taken = maps.find((m) => sameName(m.name, parsed.map.name));
		const choice = nameTakenSchema.parse(form.get('ifNameTaken'));
		if (!taken) return createAndOpen(event, access, request);
		if (choice === 'copy') {
			const name = copyName(
				parsed.map.name,
				maps.map((m) => m.name)
			);
			return createAndOpen(event, access, { ...request, name });
		}
		if (choice === 'replace') {
			const current = await requireMap(db, access.workspace.id, taken.id);
			await saveDraft(db, {
				workspaceId: access.workspace.id,
				mapId: taken.id,
				version: current.version,
				draft: { ...parsed.map, name: taken.name },
				actorId: access.user.id
			});
			redirect(303, `/w/${access.workspace.slug}/maps/${taken.id}`);
		}
		const message = `A map called “${taken.name}” exists already. Choose whether this file replaces its draft or becomes a new map, then choose the file again.`;
		throw new Problem(409, message, [{ path: 'ifNameTaken', message }]);
	})
} satisfies Actions;
