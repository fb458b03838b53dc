// The frame detail load against a fresh database: same view as the map page, plus the frame index.
import { describe, expect, it } from 'vitest';
import { createMap } from '$lib/server/maps/maps';
import { createWorkspace } from '$lib/server/workspaces/workspaces';
import {
	addMember,
	createTestServices,
	createUser,
	fixtureMap,
	makeEvent,
	outcome
} from '$lib/server/test-support';
import { load } from './+page.server';

const clubRacer = fixtureMap('club-racer-ecu.map.json');

async function world() {
	const services = await createTestServices();
	const { db } = services;
	const editor = await createUser(db, 'editor@example.test');
	const viewer = await createUser(db, 'viewer@example.test');
	const stranger = await createUser(db, 'stranger@example.test');
	const ws = await createWorkspace(db, { name: 'Frame detail team', ownerId: editor.id });
	await addMember(db, ws.id, viewer.id, 'viewer');
	const { id: mapId } = await createMap(db, {
		workspaceId: ws.id,
		map: clubRacer,
		actorId: editor.id,
		source: 'json'
	});
	const open = (user: typeof editor | null, frameIndex: string, mapIdParam = mapId) => {
		const params = { ws: ws.slug, mapId: mapIdParam, frameIndex };
		return outcome(() =>
			load(
				makeEvent({
					services,
					user,
					routeId: '/w/[ws]/maps/[mapId]/frames/[frameIndex]',
					params
				}) as never
			)
		);
	};
	return { editor, viewer, stranger, open };
}

describe('frame detail load', () => {
	it('gives the draft, its lint, the role and the frame index', async () => {
		const w = await world();
		const last = String(clubRacer.frames.length - 1);
		expect(await w.open(w.editor, last)).toMatchObject({
			kind: 'value',
			value: {
				map: { name: clubRacer.name, draft: clubRacer, version: 1 },
				role: 'owner',
				frameIndex: clubRacer.frames.length - 1
			}
		});
		expect(await w.open(w.viewer, '0')).toMatchObject({
			kind: 'value',
			value: { role: 'viewer', frameIndex: 0 }
		});
	});

	it.each(['-1', '1.5', 'x', '999'])('answers frame %s with a 404 page', async (frameIndex) => {
		const w = await world();
		expect(await w.open(w.editor, frameIndex)).toMatchObject({
			kind: 'error',
			status: 404,
			message: expect.stringMatching(/has no frame/)
		});
	});

	it('hides maps from non-members and unknown maps alike, and sends signed-out people to sign in', async () => {
		const w = await world();
		expect(await w.open(w.stranger, '0')).toMatchObject({ kind: 'error', status: 404 });
		expect(await w.open(w.editor, '0', 'no-such-map')).toEqual({
			kind: 'error',
			status: 404,
			message: 'Map not found in this workspace.'
		});
		expect(await w.open(null, '0')).toMatchObject({
			kind: 'redirect',
			status: 303,
			location: expect.stringMatching(/^\/signin\?/)
		});
	});
});
