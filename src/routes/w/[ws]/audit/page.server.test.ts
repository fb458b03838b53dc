// The audit log page's load against a fresh database: owners only, filters, keyset pages.
import { describe, expect, it } from 'vitest';
import { publishRevision } from '$lib/server/maps/revisions';
import { createMap } from '$lib/server/maps/maps';
import { changeMemberRole } from '$lib/server/workspaces/members';
import { createTeamServices, fixtureMap, outcome, pageEvents } from '$lib/server/test-support';
import type { SessionUser } from '$lib/server/guard';
import { load } from './+page.server';

type Page = {
	entries: { id: number; text: string; when: string; action: string }[];
	errors: Record<string, string[]>;
	older: number | null;
	newer: number | null;
	people: { email: string }[];
};

async function world() {
	const team = await createTeamServices('Audit team', { owner: 'Olive', editor: 'Alex' });
	const { db } = team;
	const event = pageEvents(team.services, '/w/[ws]/audit', { ws: team.workspace.slug });
	const open = async (user: SessionUser, query = '') =>
		(await load(event(user, undefined, query))) as Page;
	/** Setup only: entries at chosen times, as if recorded then. */
	const record = (n: number, at: (i: number) => string, actorId = team.users.viewer.id) =>
		db
			.insertInto('audit_log')
			.values(
				Array.from({ length: n }, (_, i) => ({
					workspace_id: team.workspace.id,
					actor_id: actorId,
					action: 'capture.process',
					target: `capture-${i}`,
					details: '{}',
					created_at: at(i)
				}))
			)
			.execute();
	return { ...team, open, record };
}

describe('audit log page', () => {
	it('is for owners: an editor gets 403, a non-member 404', async () => {
		const w = await world();
		expect(await outcome(() => w.open(w.users.editor))).toMatchObject({
			kind: 'error',
			status: 403
		});
		expect(await outcome(() => w.open(w.users.outsider))).toMatchObject({
			kind: 'error',
			status: 404
		});
	});

	it('reads each change as a sentence, newest first', async () => {
		const w = await world();
		const club = fixtureMap('club-racer-ecu.map.json');
		const { id: mapId } = await createMap(w.db, {
			workspaceId: w.workspace.id,
			map: club,
			actorId: w.users.editor.id,
			source: 'json'
		});
		await publishRevision(w.db, {
			workspaceId: w.workspace.id,
			mapId,
			version: 1,
			note: 'First',
			actorId: w.users.editor.id
		});
		await changeMemberRole(w.db, {
			workspaceId: w.workspace.id,
			userId: w.users.viewer.id,
			role: 'editor',
			actorId: w.users.owner.id
		});
		const page = await w.open(w.users.owner);
		expect(page.entries.map((e) => e.text)).toEqual([
			'Olive made viewer@example.test Editor (was Viewer)',
			`Alex published r1 of ${club.name}`,
			`Alex created the map ${club.name} from a map file`,
			'Olive created the workspace Audit team'
		]);
		expect(page.entries[0].when).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4} \d{2}:\d{2}$/);
		expect(page.people.map((p) => p.email).sort()).toEqual([
			'editor@example.test',
			'owner@example.test',
			'viewer@example.test'
		]);
	});

	it('filters by person, by kind (a subject or one verb) and by days', async () => {
		const w = await world();
		await w.record(3, (i) => `2026-11-0${i + 1}T12:00:00.000Z`); // 1, 2 and 3 Nov
		await w.record(1, () => '2026-11-02T23:59:59.999Z', w.users.editor.id);
		const kinds = async (query: string) =>
			(await w.open(w.users.owner, query)).entries.map((e) => e.action);

		expect(await kinds(`?person=${w.users.editor.id}`)).toEqual(['capture.process']);
		expect(await kinds('?kind=capture')).toHaveLength(4);
		expect(await kinds('?kind=capture.process')).toHaveLength(4);
		expect(await kinds('?kind=workspace')).toEqual(['workspace.create']);
		expect(await kinds('?kind=captur')).toEqual([]); // a subject matches whole words only
		// The last day counts to its end: the 2 Nov entries both, 23:59:59.999 included.
		expect(await kinds('?from=2026-11-02&to=2026-11-02')).toHaveLength(2);
		expect(await kinds('?kind=capture&from=2026-11-02')).toHaveLength(3); // 2 and 3 Nov
		expect(await kinds('?kind=capture&to=2026-11-01')).toHaveLength(1);
	});

	it('shows a refused filter next to its field and lists nothing', async () => {
		const w = await world();
		const page = await w.open(w.users.owner, '?from=2026-12-05&to=2026-12-01&kind=DROP');
		expect(page.entries).toEqual([]);
		expect(page.errors).toEqual({
			to: ['The last day comes before the first.'],
			kind: ['Choose a kind from the list.']
		});
		expect((await w.open(w.users.owner, '?from=tomorrow')).errors.from).toEqual([
			'A date like 2026-12-02.'
		]);
	});

	it('pages by 50 with older and newer links that keep the filter', async () => {
		const w = await world();
		await w.record(120, (i) => new Date(Date.UTC(2026, 10, 1, 0, i)).toISOString());
		const first = await w.open(w.users.owner, '?kind=capture');
		expect(first.entries).toHaveLength(50);
		expect(first.newer).toBeNull();
		const second = await w.open(w.users.owner, `?kind=capture&before=${first.older}`);
		expect(second.entries).toHaveLength(50);
		const third = await w.open(w.users.owner, `?kind=capture&before=${second.older}`);
		expect(third.entries).toHaveLength(20);
		expect(third.older).toBeNull();
		const ids = [...first.entries, ...second.entries, ...third.entries].map((e) => e.id);
		expect(new Set(ids).size).toBe(120); // every entry once, none skipped
		expect(ids).toEqual([...ids].sort((a, b) => b - a));
		// Back one page from the third: the second again.
		const back = await w.open(w.users.owner, `?kind=capture&after=${third.newer}`);
		expect(back.entries.map((e) => e.id)).toEqual(second.entries.map((e) => e.id));
		expect(back.newer).toBe(second.newer);
	});
});
