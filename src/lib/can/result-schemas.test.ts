// The zod schemas of the library's results (lint problems, map diffs, bus load, DM1 lamps, alert
// replays) describe what the functions really return: each result, computed from the demo fixtures
// (invented data) or a hand-made payload, passes its schema with nothing stripped and nothing added.
// The API contract and the OpenAPI document are built from these schemas, so a field the library
// adds without its schema fails here first. Node-only: reads files.
import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { alertReplaySchema, replayAlertRules } from './alerts/replay';
import { mapBusLoad, mapBusLoadSchema } from './busload';
import { decodeCapture } from './capture/decode-capture';
import { ingestCapture } from './capture/ingest';
import { compileMap } from './decoder';
import { dm1LampsSchema, parseDm1 } from './j1939';
import { lintMap, lintProblemSchema } from './lint';
import type { CanMap } from './map';
import { diffMaps, mapDiffSchema } from './map-diff';
import { parseMap } from './map-json';

const fixture = (name: string) =>
	readFile(new URL(`../../../fixtures/${name}`, import.meta.url), 'utf8');

async function fixtureMap(name: string): Promise<CanMap> {
	const parsed = parseMap(await fixture(name));
	if (!parsed.ok) throw new Error(`${name}: ${JSON.stringify(parsed.problems)}`);
	return parsed.map;
}

/** Parses strictly: the schema accepts the value and gives back exactly what it was given. */
function expectExactly(schema: z.ZodType, value: unknown) {
	const result = schema.safeParse(value);
	expect(result.error?.issues ?? []).toEqual([]);
	expect(result.data).toEqual(value);
}

describe('library result schemas match what the library returns', () => {
	it('lint problems, including alert-rule codes', async () => {
		const club = await fixtureMap('club-racer-ecu.map.json');
		const [first, ...rest] = club.frames;
		// Two signals on the same bits, a frame ID repeated, and a rule watching a missing signal.
		const broken: CanMap = {
			...club,
			frames: [
				{ ...first, signals: [...first.signals, { ...first.signals[0], name: 'Twin' }] },
				...rest,
				{ ...first, name: 'Copy' }
			],
			alertRules: [
				...club.alertRules,
				{ ...club.alertRules[0], id: 'ghost', channel: { frame: 'Nope', signal: 'Nope' } }
			]
		};
		const problems = lintMap(broken);
		expect(problems.map((p) => p.code)).toEqual(
			expect.arrayContaining(['signal-overlap', 'duplicate-frame-id', 'alert-unknown-frame'])
		);
		for (const problem of problems) expectExactly(lintProblemSchema, problem);
		expect(lintProblemSchema.safeParse({ ...problems[0], code: 'no-such-code' }).success).toBe(
			false
		);
	});

	it('a map diff with frames and signals added, removed and changed', async () => {
		const club = await fixtureMap('club-racer-ecu.map.json');
		const genset = await fixtureMap('genset-j1939.map.json');
		const changed: CanMap = {
			...club,
			bitrate: 250_000,
			frames: club.frames.slice(1).map((f, i) => (i === 0 ? { ...f, cycleMs: 999 } : f))
		};
		expectExactly(mapDiffSchema, diffMaps(club, changed));
		expectExactly(mapDiffSchema, diffMaps(club, genset));
	});

	it('planned bus load', async () => {
		expectExactly(mapBusLoadSchema, mapBusLoad(await fixtureMap('club-racer-ecu.map.json')));
	});

	it('DM1 lamps', () => {
		// Lamp byte 0b01_00_01_00: malfunction indicator on, amber warning on (SAE J1939-73 layout).
		const { lamps } = parseDm1(Uint8Array.of(0b0100_0100, 0xff, 0, 0, 0, 0, 0xff, 0xff));
		expect(lamps.malfunctionIndicator.state).toBe('on');
		expectExactly(dm1LampsSchema, lamps);
	});

	it('an alert replay with events', async () => {
		const map = await fixtureMap('club-racer-ecu.map.json');
		const { store } = await ingestCapture(await fixture('club-racer-session.csv'));
		const decoded = decodeCapture(store, compileMap(map));
		const replay = replayAlertRules(map, decoded.channels, decoded.duration);
		expect(replay.events.length).toBeGreaterThan(0);
		expectExactly(alertReplaySchema, replay);
	});
});
