// The capture page's bit rate form and the per-bus bus load it drives, against a fresh database and
// a two-bus capture with a direction column and a time-of-day column that passes midnight
// (invented demo traffic). Reference bit counts come from the frames spelled out bit by bit from
// the ISO 11898-1 frame layout (src/lib/can/testing/reference-frame-bits.ts), not from the code
// under test.
import { rmSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import type { CaptureBusLoadResponse, DecodeResponse } from '$lib/api/capture-views';
import type { CaptureDetail } from '$lib/api/captures';
import { referenceFrameBits } from '$lib/can/testing/reference-frame-bits';
import { importCaptureInProcess } from '$lib/server/captures/processing';
import {
	countRows,
	createPublishedMap,
	createTeamServices,
	fixtureMap,
	makeEvent,
	pageEvents,
	type TestServices
} from '$lib/server/test-support';
import { GET as busLoadRoute } from '../../../../api/workspaces/[ws]/captures/[id]/bus-load/+server';
import { POST as decodeRoute } from '../../../../api/workspaces/[ws]/captures/[id]/decode/+server';
import { GET as exportRoute } from '../../../../w/[ws]/captures/[id]/export/+server';
import { actions, load } from './+page.server';

const rows: [string, string, string, string, string][] = [];
// Bus "body" carries 0x100 every 10 ms; bus "chassis" carries 0x100 and 0x2A0, the logger sends 0x2A0.
for (let k = 0; k < 10; k++) {
	const clock = 86_399.95 + k * 0.01; // 23:59:59.950 … past midnight
	const s = clock % 86_400;
	const text = `${String(Math.floor(s / 3600)).padStart(2, '0')}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}:${(s % 60).toFixed(3).padStart(6, '0')}`;
	rows.push([text, 'body', '100', 'Rx', `11 22 33 44 55 66 77 ${k.toString(16).padStart(2, '0')}`]);
	rows.push([text, 'chassis', '100', 'Rx', `01 02 03 0${k % 10}`]);
	if (k % 2 === 0) rows.push([text, 'chassis', '2A0', 'Tx', 'FF 00 FF']);
}
const csv = ['time,bus,id,dir,data', ...rows.map((r) => r.join(','))].join('\n') + '\n';

/** Each bus's bits per the ISO 11898-1 layout: frame bits, its own stuff bits and the 3-bit intermission. */
function referenceBits(bus: string): number {
	let bits = 0;
	for (const [, b, id, , data] of rows) {
		if (b !== bus) continue;
		const bytes = Uint8Array.from(data.split(' '), (h) => Number.parseInt(h, 16));
		const ref = referenceFrameBits(Number.parseInt(id, 16), false, bytes);
		bits += ref.bits + ref.stuffBits + 3;
	}
	return bits;
}

const worlds: TestServices[] = [];
afterAll(() => worlds.forEach((s) => rmSync(s.storageRoot, { recursive: true, force: true })));

async function world() {
	const team = await createTeamServices('Two-bus team', { editor: 'Alex' });
	worlds.push(team.services);
	const map = { ...fixtureMap('club-racer-ecu.map.json'), bitrate: 250_000 };
	map.frames[0].id = 0x100; // so the map decodes the body bus's frames (demo data)
	const mapId = await createPublishedMap(team.db, {
		workspaceId: team.workspace.id,
		actorId: team.users.owner.id,
		revisions: [map]
	});
	const captureId = await importCaptureInProcess(team.services, {
		workspaceId: team.workspace.id,
		actorId: team.users.editor.id,
		fileName: 'two-buses.csv',
		text: csv
	});
	const page = pageEvents(team.services, '/w/[ws]/captures/[id]', {
		ws: team.workspace.slug,
		id: captureId
	});
	const api = (route: string, user = team.users.viewer, body?: unknown) =>
		makeEvent({
			services: team.services,
			user,
			routeId: `/api/workspaces/[ws]/captures/[id]${route}`,
			params: { ws: team.workspace.slug, id: captureId },
			body
		});
	const busLoad = async () =>
		(await (await busLoadRoute(api('/bus-load') as never)).json()) as CaptureBusLoadResponse;
	const detail = async () => (await load(page(team.users.viewer))) as unknown as CaptureDetail;
	return { ...team, mapId, captureId, page, api, busLoad, detail };
}

describe('a capture of two buses with a time of day', () => {
	it('keeps its buses, direction and clock origin in the report', async () => {
		const w = await world();
		const { report } = await w.detail();
		expect(report!.buses).toEqual(['body', 'chassis']);
		expect(report!.hasDirection).toBe(true);
		// 23:59:59.950 = 86 399.95 s after midnight.
		expect(report!.origin.kind).toBe('time-of-day');
		expect(report!.origin.seconds).toBeCloseTo(86_399.95, 9);
	});

	it('guesses the bit rate from the first decode’s map, then shows one bus load per bus at it', async () => {
		const w = await world();
		// Before any decode: the workspace's usual map bit rate, said to be a guess.
		expect((await w.detail()).bitrate).toEqual({
			bitrate: 250_000,
			dataBitrate: null,
			source: { kind: 'workspace' }
		});
		const decoded = (await (
			await decodeRoute(w.api('/decode', w.users.editor, { mapId: w.mapId, revision: 1 }) as never)
		).json()) as DecodeResponse;
		expect(decoded.summary.ids.map((s) => [s.bus, s.id])).toEqual([
			[0, 0x100],
			[1, 0x100],
			[1, 0x2a0]
		]);
		expect((await w.detail()).bitrate?.source).toEqual({
			kind: 'map',
			mapName: expect.any(String)
		});
		const load = await w.busLoad();
		expect(load.bitrate.bitrate).toBe(250_000);
		expect(load.buses.map((b) => [b.name, b.frames])).toEqual([
			['body', 10],
			['chassis', 15]
		]);
		// 90 ms of traffic: one 0.1 s window per bus.
		expect(load.windowSeconds).toBe(0.1);
		for (const b of load.buses) {
			expect(b.windows).toHaveLength(1);
			expect(b.windows[0].percent).toBeCloseTo((100 * referenceBits(b.name)) / (250_000 * 0.1), 9);
		}
	});

	it('sets the capture’s bit rate by form; the bus load follows it, not the map', async () => {
		const w = await world();
		const audit = await countRows(w.db, 'audit_log');
		const answer = await actions.bitrate(
			w.page(w.users.editor, { bitrate: '125000', dataBitrate: '' })
		);
		expect(answer).toMatchObject({ ok: true, message: 'Bit rate set to 125 kbit/s.' });
		expect(await countRows(w.db, 'audit_log')).toBe(audit + 1);
		expect((await w.detail()).bitrate).toEqual({
			bitrate: 125_000,
			dataBitrate: null,
			source: { kind: 'set' }
		});
		// A decode afterwards does not overwrite a rate a person set.
		await decodeRoute(w.api('/decode', w.users.editor, { mapId: w.mapId, revision: 1 }) as never);
		const load = await w.busLoad();
		expect(load.bitrate.bitrate).toBe(125_000);
		for (const b of load.buses)
			expect(b.windows[0].percent).toBeCloseTo((100 * referenceBits(b.name)) / (125_000 * 0.1), 9);
	});

	it('refuses bad bit rates with a message and changes nothing', async () => {
		const w = await world();
		await actions.bitrate(w.page(w.users.editor, { bitrate: '500000', dataBitrate: '2000000' }));
		const before = await w.detail();
		const audit = await countRows(w.db, 'audit_log');
		const cases: [Record<string, string>, string, RegExp][] = [
			[{ bitrate: '12', dataBitrate: '' }, 'bitrate', /from 1000 to 8000000/],
			[{ bitrate: 'fast', dataBitrate: '' }, 'bitrate', /whole number of bit\/s/],
			[{ bitrate: '500000.5', dataBitrate: '' }, 'bitrate', /whole number/],
			[{ bitrate: '500000', dataBitrate: '250000' }, 'dataBitrate', /at least the nominal/]
		];
		for (const [fields, field, message] of cases) {
			const refused = (await actions.bitrate(w.page(w.users.editor, fields))) as {
				status: number;
				data: { ok: boolean; errors: Record<string, string[]> };
			};
			expect(refused.status).toBe(400);
			expect(refused.data.ok).toBe(false);
			expect(refused.data.errors[field]?.[0]).toMatch(message);
		}
		// A viewer may look but not set it.
		const viewer = (await actions
			.bitrate(w.page(w.users.viewer, { bitrate: '250000', dataBitrate: '' }))
			.catch((e: { status: number }) => e)) as { status: number };
		expect(viewer.status).toBe(403);
		expect((await w.detail()).bitrate).toEqual(before.bitrate);
		expect(before.bitrate).toMatchObject({ bitrate: 500_000, dataBitrate: 2_000_000 });
		expect(await countRows(w.db, 'audit_log')).toBe(audit);
	});

	it('decodes one chosen bus: its figures only, recorded with the bus; a bus it does not have is refused', async () => {
		const w = await world();
		const post = async (body: unknown) =>
			decodeRoute(w.api('/decode', w.users.editor, body) as never);
		const one = (await (
			await post({ mapId: w.mapId, revision: 1, bus: 1 })
		).json()) as DecodeResponse;
		expect(one.decode.bus).toBe(1);
		expect(one.summary.ids.map((s) => [s.bus, s.id, s.count])).toEqual([
			[1, 0x100, 10],
			[1, 0x2a0, 5]
		]);
		const all = (await (await post({ mapId: w.mapId, revision: 1 })).json()) as DecodeResponse;
		expect(all.decode.bus).toBeNull();
		expect(all.summary.ids).toHaveLength(3);
		// EngineCore (here on 0x100) from the body bus alone: its 10 frames; every bus: chassis's too.
		const body = (await (
			await post({ mapId: w.mapId, revision: 1, bus: 0 })
		).json()) as DecodeResponse;
		const speed = (d: DecodeResponse) =>
			d.summary.channels.find(
				(c) => c.frameName === 'EngineCore' && c.signalName === 'EngineSpeed'
			)!;
		expect(speed(body).count).toBe(10);
		expect(speed(one).count + speed(body).count).toBe(speed(all).count);
		expect(speed(one).count).toBeGreaterThan(0);
		const decodes = (await w.db.selectFrom('capture_decodes').select('id').execute()).length;
		const refused = await post({ mapId: w.mapId, revision: 1, bus: 2 });
		expect(refused.status).toBe(400);
		expect(((await refused.json()) as { error: string }).error).toBe(
			'This capture has 2 buses (0–1: body, chassis); there is no bus 2.'
		);
		expect((await w.db.selectFrom('capture_decodes').select('id').execute()).length).toBe(decodes);
	});

	it('decoded exports keep relative seconds and add the clock, past midnight; the frames export stays canonical', async () => {
		const w = await world();
		const decoded = (await (
			await decodeRoute(
				w.api('/decode', w.users.editor, { mapId: w.mapId, revision: 1, bus: 0 }) as never
			)
		).json()) as DecodeResponse;
		const exported = async (query: string) =>
			(
				await (
					await exportRoute(
						makeEvent({
							services: w.services,
							user: w.users.viewer,
							routeId: '/w/[ws]/captures/[id]/export',
							params: { ws: w.workspace.slug, id: w.captureId },
							query
						}) as never
					)
				).text()
			)
				.trim()
				.split('\n');
		const frames = await exported('?kind=frames');
		expect(frames[0]).toBe('time,id,extended,dlc,data');
		expect(frames[1]).toBe('0,100,0,8,11 22 33 44 55 66 77 00');
		// Wide rows every 0.1 s from the first sample: 0 s is 23:59:59.950 of a day the file does not name.
		const wide = await exported(`?kind=wide&decode=${decoded.decode.id}&interval=0.05`);
		expect(wide[0]).toMatch(/,clock$/);
		expect(wide[1]).toMatch(/^0,.*,23:59:59\.950000$/);
		expect(wide[2]).toMatch(/^0\.05,.*,00:00:00\.000000 \+1 d$/);
	});
});
