// A first decode split into parts (one per worker) against the single pass it replaces for large
// captures: the same stored summary, and for every channel the same pyramid bytes and the same
// series windows, on the demo fixtures processed into many small segments.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CANONICAL_LAYOUT } from '$lib/can/capture/layout';
import { createLocalStorage } from '$lib/server/storage';
import { fixtureMap, fixtureText } from '$lib/server/test-support';
import { closeCaptureWorkers, configureCaptureWorkers, runCaptureTask } from '../pool';
import { mergeDecodeParts, pyramidsKey, runDecode, runDecodePart } from './decode';
import { runProcess } from './process';
import { runSeries } from './series';
import type { DecodePartOutcome, StoredDecode } from './tasks';

const root = mkdtempSync(join(tmpdir(), 'framewright-split-decode-'));
afterAll(async () => {
	await closeCaptureWorkers();
	configureCaptureWorkers(null);
	rmSync(root, { recursive: true, force: true });
});
const storage = createLocalStorage({ root, maxBytes: 1024 ** 3 });
const settings = storage.settings;

/** Every other EEC1 frame from a second engine (source address 0x01): a frame fed by two identifiers. */
const secondEngine = (csv: string) => {
	let n = 0;
	return csv.replace(/,0CF00400,/g, (m) => (n++ % 2 ? ',0CF00401,' : m));
};

async function* one(bytes: Uint8Array) {
	yield bytes;
}

async function pyramidOf(folder: string, entry: StoredDecode['channels'][number]) {
	if (entry.pyramidBytes === 0) return new Uint8Array(0);
	return storage.getRange(
		pyramidsKey(folder, entry.pyramidPart),
		entry.pyramidOffset,
		entry.pyramidBytes
	);
}

describe('a split first decode', () => {
	it.each([
		['club-racer-ecu.map.json', 'club-racer-session.csv', (s: string) => s],
		['genset-j1939.map.json', 'genset-idle.csv', secondEngine]
	])('%s over %s: parts merged equal the single pass', async (mapName, csvName, edit) => {
		const map = fixtureMap(mapName);
		const name = csvName.replace('.csv', '');
		await storage.put(`${name}/raw.csv`, one(new TextEncoder().encode(edit(fixtureText(csvName)))));
		const processed = await runProcess(storage, {
			rawKey: `${name}/raw.csv`,
			layout: CANONICAL_LAYOUT,
			storeFolder: `${name}/store/`,
			segmentFrames: 300
		});
		if (!processed.ok) throw new Error(processed.message);
		const on = { indexKey: processed.indexKey, map };
		const single = await runDecode(storage, { ...on, folder: `${name}/single/` });
		for (const parts of [2, 3]) {
			const folder = `${name}/split-${parts}/`;
			const outcomes = [];
			for (let part = 0; part < parts; part++)
				outcomes.push(await runDecodePart(storage, { ...on, folder, part, parts }));
			expect(outcomes.filter((o) => o !== null).length).toBeGreaterThan(1);
			const split = await mergeDecodeParts(storage, folder, outcomes);
			expect(split.summary).toEqual(single.summary);
			// The stored summary is the merged one.
			const read = JSON.parse(
				new TextDecoder().decode(await storage.getBytes(`${folder}summary.json`))
			);
			expect(read).toEqual(split);
			for (const [k, entry] of single.channels.entries()) {
				const other = split.channels[k];
				expect([other.firstTime, other.lastTime]).toEqual([entry.firstTime, entry.lastTime]);
				expect(other.pyramidPart).toBeTypeOf('number');
				expect(await pyramidOf(folder, other)).toEqual(await pyramidOf(`${name}/single/`, entry));
				if (entry.firstTime === null) continue;
				const window = {
					kind: 'series' as const,
					storage: settings,
					...on,
					channel: k,
					from: entry.firstTime,
					to: entry.lastTime!,
					points: 50
				};
				expect(await runSeries(storage, { ...window, folder, ...other })).toEqual(
					await runSeries(storage, { ...window, folder: `${name}/single/`, ...entry })
				);
			}
		}
	});
});

describe('the parts of a split decode in the worker pool', () => {
	it('run on different threads, also when one thread is already warm', async () => {
		await closeCaptureWorkers();
		configureCaptureWorkers(2);
		const map = fixtureMap('club-racer-ecu.map.json');
		await storage.put(
			'pool/raw.csv',
			one(new TextEncoder().encode(fixtureText('club-racer-session.csv')))
		);
		const processed = await runCaptureTask<{ ok: boolean; indexKey: string; threadId: number }>({
			kind: 'process',
			storage: settings,
			rawKey: 'pool/raw.csv',
			layout: CANONICAL_LAYOUT,
			storeFolder: 'pool/store/',
			segmentFrames: 300
		});
		expect(processed.ok).toBe(true);
		const on = {
			storage: settings,
			indexKey: processed.indexKey,
			map,
			folder: 'pool/decode/',
			parts: 2
		};
		const outcomes = await Promise.all(
			[0, 1].map((part) =>
				runCaptureTask<DecodePartOutcome | null>({ kind: 'decode-part', ...on, part })
			)
		);
		const threads = outcomes.map((o) => o!.threadId);
		expect(threads).toContain(processed.threadId);
		expect(new Set(threads).size).toBe(2);
	});
});
