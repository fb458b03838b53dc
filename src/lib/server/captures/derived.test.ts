// Derived channels evaluated in a capture worker (work/derived.ts), through the server functions
// the routes call: the values against a brute-force evaluation of the formula written here
// (zero-order hold on the union of the inputs' times, docs/derived-channels.md) over the decoded
// channels' samples, the span statistics against a direct mean and count, a formula that does
// not read refused with its column, and the export's derived column equal to the series.
import { rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	createPublishedMap,
	createTeam,
	createTestServices,
	fixtureMap,
	fixtureText,
	type TestServices
} from '$lib/server/test-support';
import { Problem } from '../problem';
import { decodedChannelSamples, decodeWith } from './decoding';
import { derivedSeries, exportDerived, measureSpan } from './derived';
import { importCaptureInProcess } from './processing';

let services: TestServices;
let workspaceId: string;
let captureId: string;
let decodeId: string;
afterAll(() => rmSync(services.storageRoot, { recursive: true, force: true }));

beforeAll(async () => {
	services = await createTestServices();
	const { workspace, users } = await createTeam(services.db, 'Derived team');
	workspaceId = workspace.id;
	const mapId = await createPublishedMap(services.db, {
		workspaceId,
		actorId: users.owner.id,
		revisions: [fixtureMap('club-racer-ecu.map.json')]
	});
	captureId = await importCaptureInProcess(services, {
		workspaceId,
		actorId: users.viewer.id,
		fileName: 'club-racer-session.csv',
		text: fixtureText('club-racer-session.csv')
	});
	const decoded = await decodeWith(
		services,
		workspaceId,
		captureId,
		{ mapId, revision: 1 },
		users.viewer.id
	);
	decodeId = decoded.decode.id;
	const index = (name: string) =>
		decoded.summary.channels.find((c) => c.signalName === name)!.index;
	channels = {
		speed: await decodedChannelSamples(
			services,
			workspaceId,
			captureId,
			decodeId,
			index('EngineSpeed')
		),
		oil: await decodedChannelSamples(
			services,
			workspaceId,
			captureId,
			decodeId,
			index('OilPressure')
		)
	};
});
let channels: Record<'speed' | 'oil', { time: Float64Array; value: Float64Array }>;

/** EngineSpeed / 100 + OilPressure, brute force: every input time from the latest first sample on, each input's last value at or before it. */
function reference() {
	const { speed, oil } = channels;
	const start = Math.max(speed.time[0], oil.time[0]);
	const times = [...new Set([...speed.time, ...oil.time])]
		.filter((t) => t >= start)
		.sort((a, b) => a - b);
	const held = (c: { time: Float64Array; value: Float64Array }, t: number) => {
		let v = NaN;
		for (let i = 0; i < c.time.length && c.time[i] <= t; i++) v = c.value[i];
		return v;
	};
	return { time: times, value: times.map((t) => held(speed, t) / 100 + held(oil, t)) };
}
const FORMULA = 'EngineSpeed / 100 + OilPressure';

describe('derived channels in a worker', () => {
	it('serves the formula over two channels of different frames, every sample when few enough', async () => {
		const ref = reference();
		expect(ref.time.length).toBeGreaterThan(100);
		const series = await derivedSeries(services, workspaceId, captureId, {
			decode: decodeId,
			formula: FORMULA,
			points: 100_000
		});
		expect(series.count).toBe(ref.time.length);
		expect(series.decimated).toBe(false);
		expect(series.time).toEqual(ref.time);
		series.value.forEach((v, i) => expect(v).toBeCloseTo(ref.value[i], 9));
		expect(series.inputs.length).toBe(2);
	});

	it('measures a span: count and mean as a direct computation gives them', async () => {
		const ref = reference();
		const from = ref.time[Math.floor(ref.time.length / 4)];
		const to = ref.time[Math.floor((3 * ref.time.length) / 4)];
		const inside = ref.value.filter((_, i) => ref.time[i] >= from && ref.time[i] <= to);
		const span = await measureSpan(services, workspaceId, captureId, {
			decode: decodeId,
			formula: FORMULA,
			versus: 'OilPressure',
			from,
			to,
			bins: 10
		});
		expect(span.statistics.count).toBe(inside.length);
		expect(span.statistics.mean!).toBeCloseTo(inside.reduce((a, b) => a + b, 0) / inside.length, 9);
		expect(span.histogram.counts.reduce((a: number, b: number) => a + b, 0)).toBe(inside.length);
		expect(span.xy!.x.length).toBeGreaterThan(0);
	});

	it('refuses a formula that does not read with the column, before decoding', async () => {
		const refused = derivedSeries(services, workspaceId, captureId, {
			decode: decodeId,
			formula: 'EngineSpeed + NoSuchSignal',
			points: 10
		});
		await expect(refused).rejects.toBeInstanceOf(Problem);
		await expect(refused).rejects.toMatchObject({
			status: 400,
			issues: [{ path: 'formula', column: 15 }]
		});
		const exportRefused = exportDerived(services, workspaceId, captureId, {
			decode: decodeId,
			kind: 'long',
			interval: 0.1,
			mode: 'last',
			derived: [{ name: 'Bad', unit: '', formula: 'EngineSpeed +' }]
		});
		await expect(exportRefused).rejects.toMatchObject({ status: 400 });
		// Far too many wide rows: refused before the download starts, naming the interval.
		const tooManyRows = exportDerived(services, workspaceId, captureId, {
			decode: decodeId,
			kind: 'wide',
			interval: 1e-9,
			mode: 'last',
			derived: [{ name: 'Mix', unit: '', formula: FORMULA }]
		});
		await expect(tooManyRows).rejects.toMatchObject({
			status: 400,
			issues: [{ path: 'interval' }]
		});
	});

	it('exports the derived channel after the decoded ones, its rows the series values', async () => {
		const ref = reference();
		const response = await exportDerived(services, workspaceId, captureId, {
			decode: decodeId,
			kind: 'long',
			interval: 0.1,
			mode: 'last',
			derived: [{ name: 'Mix', unit: 'x', formula: FORMULA }]
		});
		expect(response.headers.get('content-disposition')).toMatch(/\.derived\.csv"$/);
		const rows = (await response.text())
			.trim()
			.split('\n')
			.filter((line) => line.includes(',Derived,Mix,'));
		expect(rows.length).toBe(ref.time.length);
		rows.forEach((line, i) => {
			const [time, , , value] = line.split(',');
			expect(Number(time)).toBeCloseTo(ref.time[i], 6);
			expect(Number(value)).toBeCloseTo(ref.value[i], 6);
		});
	});
});
