import { checkPageQuerySchema } from '$lib/api/receivers';
import { orPageError, readQuery } from '$lib/server/api';
import { listCaptures } from '$lib/server/captures/captures-db';
import { requireRole } from '$lib/server/guard';
import { Problem } from '$lib/server/problem';
import { checkProfileOnCapture, replayProfileAlerts } from '$lib/server/receivers/capture-check';
import { requireProfile } from '$lib/server/receivers/profiles';
import { listProfileRevisions } from '$lib/server/receivers/revisions';
import type { PageServerLoad } from './$types';

// `?capture=<id>&rev=<n|draft>`: the checklist and the device alert replay are computed here for
// the first paint (reads only; nothing is stored). A capture that cannot be checked is said on the
// page, next to the picker, rather than as an error page.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const services = event.locals.services;
	return orPageError(async () => {
		const query = readQuery(event.url, checkPageQuerySchema);
		const profile = await requireProfile(services.db, workspace.id, event.params.profileId);
		const captures = (await listCaptures(services.db, workspace.id))
			.filter((c) => c.status === 'ready')
			.map((c) => ({ id: c.id, name: c.name, durationS: c.durationS, frameCount: c.frameCount }));
		const base = {
			profile: { id: profile.id, name: profile.name },
			revisions: (await listProfileRevisions(services.db, profile.id)).map((r) => r.number),
			captures,
			query: { capture: query.capture ?? null, rev: query.rev },
			role
		};
		if (!query.capture) return { ...base, result: null, problem: null };
		const input = { capture: query.capture, rev: query.rev };
		try {
			const checked = await checkProfileOnCapture(services, workspace.id, profile.id, input);
			const alerts = await replayProfileAlerts(services, workspace.id, profile.id, {
				...input,
				acknowledgements: []
			});
			return { ...base, result: { ...checked, alerts }, problem: null };
		} catch (thrown) {
			if (!(thrown instanceof Problem) || thrown.status === 404) throw thrown;
			return { ...base, result: null, problem: thrown.message };
		}
	});
}) satisfies PageServerLoad;
