// Issue 10, finding 5: names a spreadsheet would run as formulas (=HYPERLINK(…), +cmd|…, @SUM…, a
// unit of -2+3) passed straight into the map CSV export and the public share-link export. The rule
// is OWASP's "CSV Injection" guidance (owasp.org/www-community/attacks/CSV_Injection): a cell
// starting with = + - @, tab or carriage return is prefixed with a single quote; numbers stay
// numbers. The downloads are read with papaparse, an independent CSV reader, as a spreadsheet would.
import type { RequestEvent } from '@sveltejs/kit';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { CanMap } from '../../can/map';
import * as mapsRoute from '../../../routes/api/workspaces/[ws]/maps/+server';
import * as shareLinksRoute from '../../../routes/api/workspaces/[ws]/maps/[mapId]/share-links/+server';
import * as shareExport from '../../../routes/s/[token]/export/+server';
import * as exportRoute from '../../../routes/w/[ws]/maps/[mapId]/export/+server';
import { createTeam, createTestServices, fixtureMap, makeEvent } from '../test-support';
import { createMap, requireMap } from './maps';
import { publishRevision } from './revisions';

const TRIGGERS = ['=', '+', '-', '@', '\t', '\r'];

/** The genset demo map with hostile text in every text column a person can type into. */
function hostileMap(): CanMap {
	const map = structuredClone(fixtureMap('genset-j1939.map.json'));
	const frame = map.frames[0];
	frame.name = "+cmd|' /C calc'!A0";
	frame.sender = "@SUM(1+1)*cmd|' /C calc'!A0";
	frame.comment = '\t=1+2';
	const signal = frame.signals[0];
	signal.name = '=HYPERLINK("http://evil.example/phish","Open")';
	signal.unit = '-2+3';
	signal.comment = '\r=1+2';
	signal.labels = { '-1': 'Error', '0': '=Off' };
	return map;
}

async function world() {
	const services = await createTestServices();
	const team = await createTeam(services.db, 'Formula team');
	const map = hostileMap();
	const { id: mapId } = await createMap(services.db, {
		workspaceId: team.workspace.id,
		map,
		actorId: team.users.editor.id,
		source: 'json'
	});
	await publishRevision(services.db, {
		workspaceId: team.workspace.id,
		mapId,
		version: 1,
		note: 'r1',
		actorId: team.users.editor.id
	});
	const event = (routeId: string, init: Partial<Parameters<typeof makeEvent>[0]> = {}) =>
		makeEvent<RequestEvent>({
			services,
			user: team.users.editor,
			routeId,
			params: { ws: team.workspace.slug, mapId },
			...init
		});
	return { services, team, map, mapId, event };
}

/** Every cell of a CSV download, as a spreadsheet's reader splits it. */
function cells(text: string): string[][] {
	const parsed = Papa.parse<string[]>(text.trim(), { delimiter: ',', newline: '\r\n' });
	expect(parsed.errors).toEqual([]);
	return parsed.data;
}

function expectNoFormulaCell(rows: string[][]) {
	for (const row of rows)
		for (const cell of row) {
			if (cell === '' || !TRIGGERS.includes(cell[0])) continue;
			// The only cells that may start with "-" are numbers, which stay numbers.
			expect(cell, `cell ${JSON.stringify(cell)}`).toMatch(/^-\d+(\.\d+)?(e[-+]?\d+)?$/);
		}
}

describe('CSV exports of maps neutralise formula text (finding 5)', () => {
	it('the map CSV export: hostile names are quoted text, numbers stay numbers, and it imports back', async () => {
		const w = await world();
		const response = (await exportRoute.GET(
			w.event('/w/[ws]/maps/[mapId]/export', {
				path: '/w/x/maps/y/export?rev=r1&format=csv'
			}) as never
		)) as Response;
		expect(response.status).toBe(200);
		const text = await response.text();
		const rows = cells(text);
		expectNoFormulaCell(rows);
		const header = rows[0];
		const first = Object.fromEntries(header.map((name, i) => [name, rows[1][i]]));
		expect(first.signal_name).toBe(`'=HYPERLINK("http://evil.example/phish","Open")`);
		expect(first.frame_name).toBe(`'+cmd|' /C calc'!A0`);
		expect(first.sender).toBe(`'@SUM(1+1)*cmd|' /C calc'!A0`);
		expect(first.unit).toBe(`'-2+3`);
		expect(first.frame_comment).toBe(`'\t=1+2`);
		expect(first.comment).toBe(`'\r=1+2`);
		// The genset's coolant temperature: SAE J1939-71 offset −40 °C (from memory), a number cell.
		const offsets = rows.slice(1).map((r) => r[header.indexOf('offset')]);
		expect(offsets).toContain('-40');

		// Our own importer takes the quote off again: the map comes back unchanged.
		const imported = (await mapsRoute.POST(
			w.event('/api/workspaces/[ws]/maps', {
				method: 'POST',
				body: { name: w.map.name, signalTableCsv: text }
			}) as never
		)) as Response;
		expect(imported.status).toBe(201);
		const { map } = (await imported.json()) as { map: { id: string } };
		const copy = await requireMap(w.services.db, w.team.workspace.id, map.id);
		// (The table carries frames and signals; the bit rate and alert rules travel in map JSON.)
		expect(copy.draft.frames).toEqual(w.map.frames);
	});

	it('the public share-link export is neutralised the same way', async () => {
		const w = await world();
		const created = (await shareLinksRoute.POST(
			w.event('/api/workspaces/[ws]/maps/[mapId]/share-links', {
				method: 'POST',
				body: { revision: 1 }
			}) as never
		)) as Response;
		const { shareLink } = (await created.json()) as { shareLink: { url: string } };
		const token = shareLink.url.split('/s/')[1];
		const response = (await shareExport.GET(
			makeEvent({
				services: w.services,
				user: null,
				routeId: '/s/[token]/export',
				params: { token },
				path: `/s/${token}/export?format=csv`
			}) as never
		)) as Response;
		const rows = cells(await response.text());
		expectNoFormulaCell(rows);
		expect(rows.flat()).toContain(`'=HYPERLINK("http://evil.example/phish","Open")`);
	});
});
