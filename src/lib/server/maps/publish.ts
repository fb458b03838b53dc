/**
 * Publishing a map's draft and telling the workspace: the revision is stored first (`revisions.ts`),
 * then every other member gets an e-mail. A mail that fails is logged and counted, never turned into
 * a failed publish — the revision exists either way.
 */
import type { PublishedResponse } from '../../api/maps';
import { mapPaths } from '../../api/paths';
import type { WorkspaceAccess } from '../access';
import { revisionPublishedMail } from '../mail/templates';
import type { Services } from '../services';
import { listMembers } from '../workspaces/members';
import { publishRevision } from './revisions';

export async function publishAndNotify(
	services: Pick<Services, 'db' | 'sendMail'>,
	access: Pick<WorkspaceAccess, 'user' | 'workspace'>,
	input: { mapId: string; note: string; version: number; origin: string }
): Promise<PublishedResponse> {
	const { db, sendMail } = services;
	const { user, workspace } = access;
	const revision = await publishRevision(db, {
		workspaceId: workspace.id,
		mapId: input.mapId,
		version: input.version,
		note: input.note,
		actorId: user.id
	});
	const url = new URL(
		mapPaths(workspace.slug, input.mapId).revision(revision.number),
		input.origin
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
					note: input.note,
					publishedBy: user.name ?? user.email,
					workspaceName: workspace.name
				})
			)
		)
	);
	const failed = results.filter((r) => r.status === 'rejected').length;
	if (failed > 0)
		console.error(`Publish of r${revision.number}: ${failed} notification(s) could not be sent`);
	return { revision: { number: revision.number }, notified: results.length - failed };
}
