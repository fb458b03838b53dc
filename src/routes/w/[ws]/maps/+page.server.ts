import { redirect } from '@sveltejs/kit';
import { createMapInputSchema, type CreateMapInput } from '$lib/api/maps';
import type { WorkspaceAccess } from '$lib/server/access';
import { formAction, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { importMap } from '$lib/server/maps/import';
import { listMaps } from '$lib/server/maps/maps';
import { parseOrProblem, Problem } from '$lib/server/problem';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	return { maps: await listMaps(event.locals.services.db, workspace.id), role };
}) satisfies PageServerLoad;

/** The file fields of the two imports, named as in the JSON route's body. */
const IMPORT_FIELDS = ['mapJson', 'signalTableCsv'] as const;

async function importedFile(form: FormData): Promise<Record<string, string>> {
	for (const field of IMPORT_FIELDS) {
		const file = form.get(field);
		if (file instanceof File && file.size > 0) return { [field]: await file.text() };
	}
	throw new Problem(400, 'Choose a map JSON file or a CSV signal table to import.');
}

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
		const request = readForm(form, createMapInputSchema, { name: 'text' });
		return createAndOpen(event, access, request);
	}),

	// A bad file is refused whole, with every problem (line numbers for CSV rows); nothing is stored.
	import: formAction('import', async (event: RequestEvent, form) => {
		const access = await requireRole(event, 'editor');
		const request = parseOrProblem(createMapInputSchema, await importedFile(form));
		return createAndOpen(event, access, request);
	})
} satisfies Actions;
