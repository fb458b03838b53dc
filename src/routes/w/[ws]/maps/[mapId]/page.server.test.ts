// The map page's form actions against a fresh database: the form side of rename, bit rate,
// publish, restore, share links and delete (the same domain functions as the JSON routes).
import { describe, expect, it } from 'vitest';
import { findMapForWorkspace } from '$lib/server/maps/maps';
import { saveDraft } from '$lib/server/maps/drafts';
import { listRevisions } from '$lib/server/maps/revisions';
import { listShareLinks } from '$lib/server/maps/share-links';
import {
	countRows,
	createPublishedMap,
	createTeamServices,
	fixtureMap,
	outcome,
	pageEvents
} from '$lib/server/test-support';
import { actions, load } from './+page.server';

const club = fixtureMap('club-racer-ecu.map.json');

async function world() {
	const team = await createTeamServices('Map page team', { editor: 'Alex' });
	const { db } = team;
	const mapId = await createPublishedMap(db, {
		workspaceId: team.workspace.id,
		actorId: team.users.editor.id,
		revisions: [club]
	});
	const event = pageEvents(team.services, '/w/[ws]/maps/[mapId]', {
		ws: team.workspace.slug,
		mapId
	});
	const map = async () => (await findMapForWorkspace(db, team.workspace.id, mapId))!;
	return { ...team, mapId, event, map };
}

describe('map page load', () => {
	it('gives editors the share links for the first paint, viewers none', async () => {
		const w = await world();
		await actions.share(w.event(w.users.editor, { revision: 1 }));
		const asEditor = (await load(w.event(w.users.editor))) as { shareLinks: unknown[] };
		expect(asEditor.shareLinks).toHaveLength(1);
		const asViewer = (await load(w.event(w.users.viewer))) as { shareLinks: unknown[] };
		expect(asViewer.shareLinks).toEqual([]);
	});
});

describe('map page actions', () => {
	it('renames under the draft version and answers the new one; a stale version names who saved', async () => {
		const w = await world();
		const renamed = await actions.rename(
			w.event(w.users.editor, { name: ' Club racer v2 ', version: 1 })
		);
		expect(renamed).toEqual({
			action: 'rename',
			ok: true,
			message: 'Renamed to Club racer v2.',
			name: 'Club racer v2',
			version: 2
		});
		expect(await w.map()).toMatchObject({ name: 'Club racer v2', version: 2 });
		const stale = await actions.rename(w.event(w.users.owner, { name: 'Other', version: 1 }));
		expect(stale).toMatchObject({
			status: 409,
			data: { action: 'rename', ok: false, message: expect.stringContaining('changed by Alex') }
		});
		// The same name again changes nothing: no new version, no audit entry.
		const entries = await countRows(w.db, 'audit_log');
		expect(
			await actions.rename(w.event(w.users.editor, { name: 'Club racer v2', version: 2 }))
		).toMatchObject({ ok: true, version: 2 });
		expect(await countRows(w.db, 'audit_log')).toBe(entries);
	});

	it('sets the bit rate within the map format’s bounds, with a reason a person can act on', async () => {
		const w = await world();
		const refused = await actions.bitrate(w.event(w.users.editor, { bitrate: '12', version: 1 }));
		expect(refused).toMatchObject({
			status: 400,
			data: {
				errors: { bitrate: ['A whole number of bit/s from 1000 to 8000000, e.g. 500000.'] },
				values: { bitrate: '12' }
			}
		});
		expect(
			await actions.bitrate(w.event(w.users.editor, { bitrate: '250000', version: 1 }))
		).toMatchObject({
			ok: true,
			bitrate: 250_000,
			version: 2
		});
		expect((await w.map()).draft.bitrate).toBe(250_000);
		expect(
			await outcome(() =>
				actions.bitrate(w.event(w.users.viewer, { bitrate: '125000', version: 2 }))
			)
		).toMatchObject({ kind: 'error', status: 403 });
	});

	it('publishes the reviewed version with its note; a stale one is refused with who changed it', async () => {
		const w = await world();
		expect(
			await actions.publish(w.event(w.users.editor, { note: '  ', version: 1 }))
		).toMatchObject({
			status: 400,
			data: { errors: { note: ['Write a note saying what changed.'] } }
		});
		await saveDraft(w.db, {
			workspaceId: w.workspace.id,
			mapId: w.mapId,
			version: 1,
			draft: { ...club, bitrate: 250_000 },
			actorId: w.users.editor.id
		});
		const stale = await actions.publish(
			w.event(w.users.owner, { note: 'Bench figures', version: 1 })
		);
		expect(stale).toMatchObject({
			status: 409,
			data: {
				action: 'publish',
				message: expect.stringContaining('changed by Alex'),
				values: { note: 'Bench figures' }
			}
		});
		const published = await actions.publish(
			w.event(w.users.owner, { note: 'Bench figures', version: 2 })
		);
		expect(published).toEqual({
			action: 'publish',
			ok: true,
			message: 'Published r2. 2 members were e-mailed the note.'
		});
		expect((await listRevisions(w.db, w.mapId)).map((r) => r.note)).toEqual([
			'Bench figures',
			'r1'
		]);
		expect(w.services.outbox.map((m) => m.to).sort()).toEqual([
			'editor@example.test',
			'viewer@example.test'
		]);
	});

	it('restores a revision into the draft under the draft version', async () => {
		const w = await world();
		await actions.bitrate(w.event(w.users.editor, { bitrate: '125000', version: 1 }));
		expect(
			await actions.restore(w.event(w.users.editor, { revision: 1, version: 2 }))
		).toMatchObject({ ok: true, message: expect.stringContaining('copy of r1') });
		expect(await w.map()).toMatchObject({ version: 3, draft: { bitrate: club.bitrate } });
		expect(
			await actions.restore(w.event(w.users.editor, { revision: 9, version: 3 }))
		).toMatchObject({ status: 404 });
	});

	it('creates a share link through a day (UTC without scripts, or the browser’s own end of day) and revokes it', async () => {
		const w = await world();
		const noScript = await actions.share(
			w.event(w.users.editor, { revision: 1, expires: '2099-01-31' })
		);
		expect(noScript).toMatchObject({
			ok: true,
			url: expect.stringMatching(/^http:\/\/localhost\/s\/[\w-]+$/)
		});
		const withScript = await actions.share(
			w.event(w.users.editor, {
				revision: 1,
				expires: '2099-01-31',
				expiresAt: '2099-01-31T22:59:59.000Z'
			})
		);
		expect(withScript).toMatchObject({ ok: true });
		const links = await listShareLinks(w.db, w.workspace.id, w.mapId);
		expect(links.map((l) => l.expiresAt).sort()).toEqual([
			'2099-01-31T22:59:59.000Z',
			'2099-01-31T23:59:59.000Z'
		]);
		expect(
			await actions.share(w.event(w.users.editor, { revision: 1, expires: '2001-01-01' }))
		).toMatchObject({ status: 400, data: { message: 'The expiry must be in the future.' } });
		expect(
			await actions.share(w.event(w.users.editor, { revision: 1, expires: 'soon' }))
		).toMatchObject({ status: 400, data: { errors: { expires: ['A date like 2027-01-31.'] } } });

		expect(await actions.unshare(w.event(w.users.editor, { id: links[0].id }))).toMatchObject({
			ok: true
		});
		expect((await listShareLinks(w.db, w.workspace.id, w.mapId))[0].status).toBe('revoked');
	});

	it('deletes for owners only, then opens the maps list', async () => {
		const w = await world();
		expect(await outcome(() => actions.delete(w.event(w.users.editor, {})))).toMatchObject({
			kind: 'error',
			status: 403
		});
		expect(await outcome(() => actions.delete(w.event(w.users.owner, {})))).toMatchObject({
			kind: 'redirect',
			location: `/w/${w.workspace.slug}/maps`
		});
		expect(await countRows(w.db, 'maps')).toBe(0);
	});
});
