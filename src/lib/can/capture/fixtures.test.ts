// Checks that the demo fixtures show what scripts/make-fixtures.ts says they show (demo data, not
// check values). Node-only test: it reads the files from disk.
import { createReadStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { compileMap } from '../decoder';
import { parseMap } from '../map-json';
import { decodeCapture } from './decode-capture';
import { ingestCapture } from './ingest';

const fixture = (name: string) => new URL(`../../../../fixtures/${name}`, import.meta.url);

async function load(mapName: string, captureName: string) {
	const parsed = parseMap(await readFile(fixture(mapName), 'utf8'));
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
	const imported = await ingestCapture(createReadStream(fixture(captureName)));
	return { imported, decoded: decodeCapture(imported.store, compileMap(parsed.map)) };
}

describe('demo fixtures', () => {
	it('club racer session: every row reads, two undocumented IDs, the oil-pressure dip', async () => {
		const { imported, decoded } = await load('club-racer-ecu.map.json', 'club-racer-session.csv');
		expect(imported.badRowCount).toBe(0);
		expect(imported.layout.hasHeader).toBe(true);
		expect(decoded.duration).toBeGreaterThan(59);
		expect(decoded.unknownIds.map((u) => u.id)).toEqual([0x5f8, 0x640]);
		// The rolling counter in byte 0 of 0x5F8 changes bit 0 in every frame.
		expect(decoded.unknownIds[0].bitChanges[0]).toBe(decoded.unknownIds[0].count - 1);
		const core = decoded.ids.find((s) => s.id === 0x5f0)!;
		expect(core.cycleMs).toBe(10);
		expect(core.meanPeriodMs).toBeCloseTo(10, 1);
		const oil = decoded.channels.find((c) => c.info.signalName === 'OilPressure')!;
		expect(oil.min).toBeLessThan(200); // below the map's min during the dip
		expect(oil.outOfRangeCount).toBeGreaterThan(0);
		const coolant = decoded.channels.find((c) => c.info.signalName === 'CoolantTemp')!;
		expect(coolant.last! - coolant.value[0]).toBeGreaterThan(10); // warming up
		expect(decoded.busLoad.meanPercent).toBeGreaterThan(3);
		expect(decoded.busLoad.meanPercent).toBeLessThan(10);
		expect(decoded.j1939).toBeNull();
	});

	it('genset idle: DM1 single frames and BAM transfers with two trouble codes', async () => {
		const { imported, decoded } = await load('genset-j1939.map.json', 'genset-idle.csv');
		expect(imported.badRowCount).toBe(0);
		const scan = decoded.j1939!;
		expect(scan.transportProblems).toEqual([]);
		expect(scan.transportMessages.length).toBe(10);
		expect(scan.dm1.some((m) => !m.viaTransport && m.troubleCodes.length === 1)).toBe(true);
		expect(scan.dm1.some((m) => m.viaTransport && m.troubleCodes.length === 2)).toBe(true);
		expect(scan.troubleCodes.map((c) => [c.spn, c.fmi])).toEqual([
			[100, 18],
			[111, 18]
		]);
		const speed = decoded.channels.find((c) => c.info.signalName === 'EngineSpeed')!;
		expect(speed.mean!).toBeGreaterThan(1490);
		expect(speed.mean!).toBeLessThan(1510);
		// TP.CM, TP.DT and the generator controller's proprietary frames are not in the map.
		expect(decoded.unknownIds.length).toBe(4);
	});
});
