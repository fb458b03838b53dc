// Issue 10, finding 9: two publishes of the same draft version both succeeded (r2 and r3 identical,
// the members mailed twice). The second must be refused with 409 and change nothing.
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import * as revisionsRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/revisions/+server';
import { countRows, createTeam, createTestServices, fixtureMap, makeEvent } from '../test-support';
import { createMap } from './maps';

async function world() {
	const services = await createTestServices();
	const team = await createTeam(services.db, 'Publish team');
	const { id: mapId } = await createMap(services.db, {
		workspaceId: team.workspace.id,
		map: fixtureMap('club-racer-ecu.map.json'),
		actorId: team.users.editor.id,
		source: 'json'
	});
	const publish = (version: number, note: string) =>
		revisionsRoute.POST(
			makeEvent<RequestEvent>({
				services,
				user: team.users.editor,
				routeId: '/api/workspaces/[ws]/maps/[mapId]/revisions',
				params: { ws: team.workspace.slug, mapId },
				method: 'POST',
				body: { version, note }
			}) as never
		) as Promise<Response>;
	return { services, publish };
}

describe('publishing the same draft version twice', () => {
	it('publishes r1 once; the second request gets 409 naming r1, and no second mail goes out', async () => {
		const w = await world();
		const first = await w.publish(1, 'First release');
		expect(first.status).toBe(201);
		const mailsAfterFirst = w.services.outbox.length;
		expect(mailsAfterFirst).toBe(2); // the owner and the viewer: every member but the publisher

		const second = await w.publish(1, 'First release');
		expect(second.status).toBe(409);
		const body = (await second.json()) as { error: string; currentVersion: number };
		expect(body.error).toMatch(/already published as r1/);
		expect(body.currentVersion).toBe(1);
		expect(await countRows(w.services.db, 'map_revisions')).toBe(1);
		expect(w.services.outbox).toHaveLength(mailsAfterFirst);
	});

	it('two publishes sent at once still make one revision', async () => {
		const w = await world();
		const answers = await Promise.all([w.publish(1, 'a'), w.publish(1, 'b')]);
		expect(answers.map((r) => r.status).sort()).toEqual([201, 409]);
		expect(await countRows(w.services.db, 'map_revisions')).toBe(1);
	});
});
