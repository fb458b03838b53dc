import { installSheetQuerySchema } from '$lib/api/receivers';
import { orPageError, readQuery } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { installSheet } from '$lib/server/receivers/export';
import type { PageServerLoad } from './$types';

// The printable install sheet of a profile's draft or revision, from the same receive set the
// download holds.
export const load = (async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	return orPageError(async () => {
		const { rev } = readQuery(event.url, installSheetQuerySchema);
		const sheet = await installSheet(
			event.locals.services.db,
			workspace.id,
			event.params.profileId,
			rev
		);
		return { sheet, profileId: event.params.profileId };
	});
}) satisfies PageServerLoad;
