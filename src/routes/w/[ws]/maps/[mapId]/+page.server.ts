import { redirect } from '@sveltejs/kit';
import {
	bitrateInputSchema,
	publishInputSchema,
	renameInputSchema,
	restoreInputSchema,
	shareLinkFormSchema,
	shareLinkRefSchema
} from '$lib/api/maps';
import { roleAtLeast } from '$lib/roles';
import { orPageError } from '$lib/server/api';
import { formAction, readForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { renameMap, setMapBitrate } from '$lib/server/maps/drafts';
import { deleteMap } from '$lib/server/maps/maps';
import { publishAndNotify } from '$lib/server/maps/publish';
import { restoreRevision } from '$lib/server/maps/revisions';
import { listShareLinks, revokeShareLink, shareRevision } from '$lib/server/maps/share-links';
import { mapView } from '$lib/server/maps/views';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

// The same map view as GET /api/workspaces/[ws]/maps/[mapId], and for editors the share links,
// for the first paint. The grid edits save through the JSON API; the forms below are actions.
export const load = (async (event) => {
	const { workspace, role } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	const { mapId } = event.params;
	return orPageError(async () => ({
		...(await mapView(db, workspace.id, mapId, role)),
		shareLinks: roleAtLeast(role, 'editor') ? await listShareLinks(db, workspace.id, mapId) : []
	}));
}) satisfies PageServerLoad;

/**
 * The guard of every action here, with what they act on: the map from the path, by whom, in which
 * workspace (the draft version comes from the form).
 */
async function mapAccess(event: RequestEvent, minimum: 'editor' | 'owner' = 'editor') {
	const access = await requireRole(event, minimum);
	const map = {
		workspaceId: access.workspace.id,
		mapId: event.params.mapId,
		actorId: access.user.id
	};
	return { access, db: event.locals.services.db, map };
}

export const actions = {
	// Answers the name and the new draft version, so an open editor can mirror them (MapDraft.applied).
	rename: formAction('rename', async (event: RequestEvent, form) => {
		const { db, map } = await mapAccess(event);
		const input = readForm(form, renameInputSchema, { name: 'text', version: 'number' });
		const { version } = await renameMap(db, { ...map, ...input });
		return { message: `Renamed to ${input.name}.`, name: input.name, version };
	}),

	bitrate: formAction('bitrate', async (event: RequestEvent, form) => {
		const { db, map } = await mapAccess(event);
		const input = readForm(form, bitrateInputSchema, { bitrate: 'number', version: 'number' });
		const { version } = await setMapBitrate(db, { ...map, ...input });
		return {
			message: `Bit rate set to ${input.bitrate / 1000} kbit/s.`,
			bitrate: input.bitrate,
			version
		};
	}),

	// A draft changed since the page loaded it is refused (409) with who changed it and when.
	publish: formAction('publish', async (event: RequestEvent, form) => {
		const { access } = await mapAccess(event);
		const { note, version } = readForm(form, publishInputSchema, {
			note: 'text',
			version: 'number'
		});
		const { revision, notified } = await publishAndNotify(event.locals.services, access, {
			mapId: event.params.mapId,
			note,
			version,
			origin: event.url.origin
		});
		const told =
			notified === 0
				? 'No member was'
				: notified === 1
					? 'One member was'
					: `${notified} members were`;
		return { message: `Published r${revision.number}. ${told} e-mailed the note.` };
	}),

	restore: formAction('restore', async (event: RequestEvent, form) => {
		const { db, map } = await mapAccess(event);
		const input = readForm(form, restoreInputSchema, { revision: 'number', version: 'number' });
		await restoreRevision(db, { ...map, ...input });
		return {
			message: `The draft is now a copy of r${input.revision}. Publish it to make it current.`
		};
	}),

	// The link's URL (with its token) is in this answer only; the database keeps a hash.
	share: formAction('share', async (event: RequestEvent, form) => {
		const { db, map } = await mapAccess(event);
		const input = readForm(form, shareLinkFormSchema, {
			revision: 'number',
			expires: 'optional',
			expiresAt: 'optional'
		});
		const { shareLink } = await shareRevision(db, {
			...map,
			...input,
			origin: event.url.origin
		});
		return {
			message: `Share link to r${shareLink.revision} created.`,
			url: shareLink.url
		};
	}),

	unshare: formAction('unshare', async (event: RequestEvent, form) => {
		const { db, map } = await mapAccess(event);
		const { id } = readForm(form, shareLinkRefSchema, { id: 'text' });
		await revokeShareLink(db, { ...map, id });
		return { message: 'Share link revoked: it no longer opens the revision.' };
	}),

	delete: formAction('delete', async (event: RequestEvent) => {
		const { access, db, map } = await mapAccess(event, 'owner');
		await deleteMap(db, map);
		redirect(303, `/w/${access.workspace.slug}/maps`);
	})
} satisfies Actions;
