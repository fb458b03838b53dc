// Share links, the public /s/[token] pages and the map page loads, against a fresh database.
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as shareLinksRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/share-links/+server';
import * as shareLinkRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/share-links/[id]/+server';
import * as mapRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/+server';
import * as sharePage from '../../../routes/s/[token]/+page.server';
import * as shareExport from '../../../routes/s/[token]/export/+server';
import * as shareSheet from '../../../routes/s/[token]/sheet/+page.server';
import * as mapsPage from '../../../routes/w/[ws]/maps/+page.server';
import * as mapPage from '../../../routes/w/[ws]/maps/[mapId]/+page.server';
import * as sheetPage from '../../../routes/w/[ws]/maps/[mapId]/sheet/+page.server';
import * as diffPage from '../../../routes/w/[ws]/maps/[mapId]/diff/+page.server';
import * as revisionPage from '../../../routes/w/[ws]/maps/[mapId]/revisions/[n]/+page.server';
import { saveDraft } from './drafts';
import { createMap } from './maps';
import { publishRevision } from './revisions';
import { findSharedRevision } from './share-links';
import { createWorkspace } from '../workspaces/workspaces';
import { SHARE_LINK_GONE } from './views';
import {
	addMember,
	countRows,
	createTestServices,
	createUser,
	fixtureMap,
	makeEvent,
	outcome
} from '../test-support';

const genset = fixtureMap('genset-j1939.map.json');

async function buildWorld() {
	const services = await createTestServices();
	const { db } = services;
	const editor = await createUser(db, 'editor@example.test', 'Editor');
	const viewer = await createUser(db, 'viewer@example.test');
	const ws = await createWorkspace(db, { name: 'Share test team', ownerId: editor.id });
	await addMember(db, ws.id, viewer.id, 'viewer');
	const { id: mapId } = await createMap(db, {
		workspaceId: ws.id,
		map: genset,
		actorId: editor.id,
		source: 'json'
	});
	await publishRevision(db, {
		workspaceId: ws.id,
		mapId,
		version: 1,
		note: 'As installed',
		actorId: editor.id
	});
	const params = { ws: ws.slug, mapId };
	const api = (
		handler: unknown,
		routeId: string,
		init: { method?: string; body?: unknown; params?: Record<string, string> } = {}
	) =>
		(handler as (e: RequestEvent) => Promise<Response>)(
			makeEvent({
				services,
				user: editor,
				routeId,
				params: { ...params, ...init.params },
				method: init.method,
				body: init.body
			})
		);
	const share = async (body: unknown) => {
		const response = await api(
			shareLinksRoute.POST,
			'/api/workspaces/[ws]/maps/[mapId]/share-links',
			{ method: 'POST', body }
		);
		expect(response.status).toBe(201);
		const { shareLink } = (await response.json()) as {
			shareLink: { id: string; url: string; revision: number; expiresAt: string | null };
		};
		return { ...shareLink, token: shareLink.url.split('/s/')[1] };
	};
	/** Runs a public page load signed out, as a customer would open the link. */
	const open = (load: unknown, token: string, routeId = '/s/[token]', path?: string) =>
		outcome(() =>
			(load as (e: unknown) => unknown)(
				makeEvent({ services, user: null, routeId, params: { token }, path })
			)
		);
	return { services, db, editor, viewer, ws, mapId, params, api, share, open };
}

describe('share links', () => {
	it('open one revision signed out, then give 404 once revoked', async () => {
		const w = await buildWorld();
		const link = await w.share({ revision: 1 });
		expect(link.url).toMatch(/^http:\/\/localhost\/s\/[\w-]{20,}$/);
		// Only a hash is stored: the token itself appears nowhere in the table.
		const stored = await w.db
			.selectFrom('share_links')
			.select('token_hash')
			.executeTakeFirstOrThrow();
		expect(stored.token_hash).not.toContain(link.token);

		const opened = await w.open(sharePage.load, link.token);
		expect(opened).toMatchObject({
			kind: 'value',
			value: {
				shared: { mapName: genset.name, revision: { number: 1, note: 'As installed' }, map: genset }
			}
		});

		const file = (await shareExport.GET(
			makeEvent({
				services: w.services,
				user: null,
				routeId: '/s/[token]/export',
				params: { token: link.token },
				path: `/s/${link.token}/export?format=csv`
			}) as never
		)) as Response;
		expect(file.headers.get('content-disposition')).toBe(
			'attachment; filename="generator-set-engine-j1939-r1.signals.csv"'
		);
		expect(file.headers.get('x-framewright-revision')).toBe('r1');

		const revoke = await w.api(
			shareLinkRoute.DELETE,
			'/api/workspaces/[ws]/maps/[mapId]/share-links/[id]',
			{ method: 'DELETE', params: { id: link.id } }
		);
		expect(revoke.status).toBe(204);
		expect(await w.open(sharePage.load, link.token)).toEqual({
			kind: 'error',
			status: 404,
			message: SHARE_LINK_GONE
		});
		expect(await w.open(shareSheet.load, link.token, '/s/[token]/sheet')).toEqual({
			kind: 'error',
			status: 404,
			message: SHARE_LINK_GONE
		});
		await expect(
			shareExport.GET(
				makeEvent({
					services: w.services,
					user: null,
					routeId: '/s/[token]/export',
					params: { token: link.token }
				}) as never
			)
		).rejects.toMatchObject({ status: 404 });

		const list = (await (
			await w.api(shareLinksRoute.GET, '/api/workspaces/[ws]/maps/[mapId]/share-links')
		).json()) as { shareLinks: { id: string; status: string }[] };
		expect(list.shareLinks).toEqual([expect.objectContaining({ id: link.id, status: 'revoked' })]);
		const actions = (
			await w.db
				.selectFrom('audit_log')
				.select('action')
				.where('action', 'like', 'share_link.%')
				.orderBy('id')
				.execute()
		).map((r) => r.action);
		expect(actions).toEqual(['share_link.create', 'share_link.revoke']);
	});

	it('stop working after their expiry', async () => {
		const w = await buildWorld();
		const expiresAt = new Date(Date.now() + 60 * 60_000).toISOString();
		const link = await w.share({ revision: 1, expiresAt });
		expect(link.expiresAt).toBe(expiresAt);
		expect(await findSharedRevision(w.db, link.token)).toBeDefined();
		expect(
			await findSharedRevision(w.db, link.token, new Date(Date.now() + 61 * 60_000))
		).toBeUndefined();
		// Let the clock pass the expiry in the database itself, then open the page as a customer.
		await w.db
			.updateTable('share_links')
			.set({ expires_at: new Date(Date.now() - 1000).toISOString() })
			.execute();
		expect(await w.open(sharePage.load, link.token)).toEqual({
			kind: 'error',
			status: 404,
			message: SHARE_LINK_GONE
		});
	});

	it('unknown tokens get the same 404, and links need a published revision', async () => {
		const w = await buildWorld();
		expect(await w.open(sharePage.load, 'not-a-token')).toEqual({
			kind: 'error',
			status: 404,
			message: SHARE_LINK_GONE
		});
		const before = await countRows(w.db, 'share_links');
		const response = await w.api(
			shareLinksRoute.POST,
			'/api/workspaces/[ws]/maps/[mapId]/share-links',
			{ method: 'POST', body: { revision: 9 } }
		);
		expect(response.status).toBe(404);
		const past = await w.api(
			shareLinksRoute.POST,
			'/api/workspaces/[ws]/maps/[mapId]/share-links',
			{ method: 'POST', body: { revision: 1, expiresAt: '2020-01-01T00:00:00Z' } }
		);
		expect(past.status).toBe(400);
		expect(await countRows(w.db, 'share_links')).toBe(before);
	});
});

describe('map page loads', () => {
	const load = (
		w: Awaited<ReturnType<typeof buildWorld>>,
		fn: unknown,
		routeId: string,
		query = '',
		extra: Record<string, string> = {}
	) => {
		const params = { ...w.params, ...extra };
		const path =
			routeId.replace(/\[(\w+)\]/g, (_, k: string) => params[k as keyof typeof params] ?? k) +
			query;
		return outcome(() =>
			(fn as (e: unknown) => unknown)(
				makeEvent({ services: w.services, user: w.viewer, routeId, params, path })
			)
		);
	};

	it('the map page gets the same shape as GET map (and, for a viewer, no share links)', async () => {
		const w = await buildWorld();
		const page = await load(w, mapPage.load, '/w/[ws]/maps/[mapId]');
		const api = await (
			await mapRoute.GET(
				makeEvent({
					services: w.services,
					user: w.viewer,
					routeId: '/api/workspaces/[ws]/maps/[mapId]',
					params: w.params
				}) as never
			)
		).json();
		expect(page).toEqual({ kind: 'value', value: { ...api, shareLinks: [] } });
		expect(api).toMatchObject({
			map: { name: genset.name, version: 1 },
			lint: [],
			role: 'viewer',
			revisions: [{ number: 1, note: 'As installed' }]
		});
	});

	it('the list page lists maps with their latest revision and frame count', async () => {
		const w = await buildWorld();
		const page = await load(w, mapsPage.load, '/w/[ws]/maps');
		expect(page).toMatchObject({
			kind: 'value',
			value: {
				maps: [
					{
						id: w.mapId,
						name: genset.name,
						latestRevision: 1,
						frameCount: genset.frames.length,
						updatedBy: { email: 'editor@example.test', name: 'Editor' }
					}
				]
			}
		});
	});

	it('the sheet states map name, revision and publish date; an unknown map is a 404 page', async () => {
		const w = await buildWorld();
		const sheet = await load(w, sheetPage.load, '/w/[ws]/maps/[mapId]/sheet', '?rev=1');
		expect(sheet).toMatchObject({
			kind: 'value',
			value: { label: 'r1', note: 'As installed', map: { name: genset.name } }
		});
		expect((sheet as { value: { publishedAt: string } }).value.publishedAt).toMatch(
			/^\d{4}-\d\d-\d\dT/
		);
		expect(
			await load(w, sheetPage.load, '/w/[ws]/maps/[mapId]/sheet', '', { mapId: 'nope' })
		).toEqual({ kind: 'error', status: 404, message: 'Map not found in this workspace.' });
	});

	it('the diff page compares the latest revision with the draft by default', async () => {
		const w = await buildWorld();
		const changed = structuredClone(genset);
		changed.frames[0].signals[0].scale *= 2;
		await saveDraft(w.db, {
			workspaceId: w.ws.id,
			mapId: w.mapId,
			version: 1,
			draft: changed,
			actorId: w.editor.id
		});
		const page = (await load(w, diffPage.load, '/w/[ws]/maps/[mapId]/diff')) as {
			value: {
				from: unknown;
				to: unknown;
				diff: { frames: { status: string; signals: { changes: { field: string }[] }[] }[] };
			};
		};
		expect(page.value.from).toBe(1);
		expect(page.value.to).toBe('draft');
		expect(page.value.diff.frames[0].status).toBe('changed');
		expect(page.value.diff.frames[0].signals[0].changes.map((c) => c.field)).toEqual(['scale']);
	});

	it('the revision page shows r1 and 404s for a revision that does not exist', async () => {
		const w = await buildWorld();
		expect(
			await load(w, revisionPage.load, '/w/[ws]/maps/[mapId]/revisions/[n]', '', { n: '1' })
		).toMatchObject({ kind: 'value', value: { revision: { number: 1, map: genset }, lint: [] } });
		expect(
			await load(w, revisionPage.load, '/w/[ws]/maps/[mapId]/revisions/[n]', '', { n: '2' })
		).toMatchObject({ kind: 'error', status: 404 });
	});
});
