// The maps list's forms: a blank map and the two file imports, against a fresh database.
import { describe, expect, it } from 'vitest';
import { listMaps } from '$lib/server/maps/maps';
import { createTeamServices, fixtureText, outcome, pageEvents } from '$lib/server/test-support';
import { actions } from './+page.server';

async function world() {
	const team = await createTeamServices('Maps list team');
	const event = pageEvents(team.services, '/w/[ws]/maps', { ws: team.workspace.slug });
	const maps = () => listMaps(team.db, team.workspace.id);
	return { ...team, event, maps };
}

const fileForm = (field: string, name: string, text: string) => {
	const form = new FormData();
	form.append(field, new File([text], name));
	return form;
};

describe('maps list actions', () => {
	it('creates a blank map and opens it; an empty name is refused next to its field', async () => {
		const w = await world();
		const refused = await actions.create(w.event(w.users.editor, { name: '  ' }));
		expect(refused).toMatchObject({
			status: 400,
			data: { errors: { name: ['A map needs a name.'] } }
		});
		const made = await outcome(() =>
			actions.create(w.event(w.users.editor, { name: 'Gearbox node' }))
		);
		const [map] = await w.maps();
		expect(made).toEqual({
			kind: 'redirect',
			status: 303,
			location: `/w/${w.workspace.slug}/maps/${map.id}`
		});
		expect(map.name).toBe('Gearbox node');
		expect(
			await outcome(() => actions.create(w.event(w.users.viewer, { name: 'No' })))
		).toMatchObject({ kind: 'error', status: 403 });
	});

	it('imports a map file; a bad one is refused whole with its problems and nothing stored', async () => {
		const w = await world();
		const good = fixtureText('club-racer-ecu.map.json');
		const imported = await outcome(() =>
			actions.import(w.event(w.users.editor, fileForm('mapJson', 'club.json', good)))
		);
		expect(imported).toMatchObject({ kind: 'redirect', status: 303 });
		expect((await w.maps()).map((m) => m.name)).toEqual([JSON.parse(good).name]);

		const bad = good.replace('"framewright-map@1"', '"something-else@9"');
		const refused = await actions.import(
			w.event(w.users.editor, fileForm('mapJson', 'bad.json', bad))
		);
		expect(refused).toMatchObject({
			status: 400,
			data: { action: 'import', message: expect.stringMatching(/nothing was imported/) }
		});
		expect((refused as { data: { issues: unknown[] } }).data.issues.length).toBeGreaterThan(0);
		const csv = await actions.import(
			w.event(w.users.editor, fileForm('signalTableCsv', 'bad.csv', 'not,a,signal table\n1,2,3'))
		);
		expect(csv).toMatchObject({
			status: 400,
			data: { issues: expect.arrayContaining([expect.objectContaining({ line: 1 })]) }
		});
		expect(await w.maps()).toHaveLength(1);
		expect(await actions.import(w.event(w.users.editor, new FormData()))).toMatchObject({
			status: 400,
			data: { message: 'Choose a map JSON file or a CSV signal table to import.' }
		});
	});
});
