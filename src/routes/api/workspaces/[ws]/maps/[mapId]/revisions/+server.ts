import { json } from '@sveltejs/kit';
import { apiRoute, readJsonBody } from '$lib/server/api';
import { listMembers } from '$lib/server/db/members';
import { requireMap } from '$lib/server/db/maps';
import { listRevisions, publishRevision } from '$lib/server/db/revisions';
import { requireRole } from '$lib/server/guard';
import { revisionPublishedMail } from '$lib/server/mail/templates';
import { publishInputSchema } from '$lib/server/map-schemas';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = apiRoute(async (event) => {
	const { workspace } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	const map = await requireMap(db, workspace.id, event.params.mapId);
	return json({ revisions: await listRevisions(db, map.id) });
});

export const POST: RequestHandler = apiRoute(async (event) => {
	const { user, workspace } = await requireRole(event, 'editor');
	const { note, version } = await readJsonBody(event.request, publishInputSchema);
	const { db, sendMail } = event.locals.services;
	const revision = await publishRevision(db, {
		workspaceId: workspace.id,
		mapId: event.params.mapId,
		version,
		note,
		actorId: user.id
	});

	// The revision is already stored; a mail failure is reported, not turned into a failed publish.
	const url = new URL(
		`/w/${workspace.slug}/maps/${event.params.mapId}/revisions/${revision.number}`,
		event.url.origin
	).toString();
	const recipients = (await listMembers(db, workspace.id)).filter((m) => m.userId !== user.id);
	const results = await Promise.allSettled(
		recipients.map((member) =>
			sendMail(
				revisionPublishedMail({
					to: member.email,
					url,
					mapName: revision.map.name,
					revision: revision.number,
					note,
					publishedBy: user.name ?? user.email,
					workspaceName: workspace.name
				})
			)
		)
	);
	const failed = results.filter((r) => r.status === 'rejected').length;
	if (failed > 0)
		console.error(`Publish of r${revision.number}: ${failed} notification(s) could not be sent`);
	return json(
		{ revision: { number: revision.number }, notified: results.length - failed },
		{ status: 201 }
	);
});
