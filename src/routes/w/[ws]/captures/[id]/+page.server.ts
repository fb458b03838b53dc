import { captureBitrateInputSchema } from '$lib/api/captures';
import { orPageError } from '$lib/server/api';
import { setCaptureBitrate } from '$lib/server/captures/bus-load';
import { captureDetail } from '$lib/server/captures/captures-db';
import { formAction, readForm } from '$lib/server/forms';
import { mapsWithRevisions } from '$lib/server/maps/revisions';
import { requireRole } from '$lib/server/guard';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load = (async (event) => {
	const { workspace, role, user } = await requireRole(event, 'viewer');
	const { db } = event.locals.services;
	return orPageError(async () => ({
		...(await captureDetail(db, workspace.id, event.params.id)),
		maps: await mapsWithRevisions(db, workspace.id),
		role,
		userEmail: user.email
	}));
}) satisfies PageServerLoad;

export const actions = {
	// The bus the capture was recorded on: bus load and frame timing follow it, whatever map decodes.
	bitrate: formAction('bitrate', async (event: RequestEvent, form) => {
		const { user, workspace } = await requireRole(event, 'editor');
		const input = readForm(form, captureBitrateInputSchema, {
			bitrate: 'number',
			dataBitrate: 'number'
		});
		const set = await setCaptureBitrate(event.locals.services.db, {
			workspaceId: workspace.id,
			captureId: event.params.id,
			actorId: user.id,
			...input
		});
		const data = set.dataBitrate === null ? '' : `, data phase ${set.dataBitrate / 1000} kbit/s`;
		return { message: `Bit rate set to ${set.bitrate / 1000} kbit/s${data}.` };
	})
} satisfies Actions;
