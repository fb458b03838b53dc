// Node-only: reads the demo capture from disk. The demo data is only input here; every expected value
// is computed in this file from the CSV text, with DataView reading the payload bytes.
import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { decodeChannels } from '../capture/channels';
import { ingestCapture } from '../capture/ingest';
import { compileMap } from '../decoder';
import { parseMap } from '../map-json';
import { evaluateFormula, type SampledChannel } from './evaluate';

const fixture = (name: string) =>
	readFile(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');

/** Rows of the canonical CSV (docs/capture-csv.md) with the payload in a DataView. */
async function fixtureRows() {
	const text = await fixture('club-racer-session.csv');
	return text
		.trim()
		.split('\n')
		.slice(1)
		.map((line) => {
			const [time, id, , , data] = line.split(',');
			const bytes = Uint8Array.from(data.trim().split(/\s+/), (h) => Number.parseInt(h, 16));
			return { time: Number(time), id: Number.parseInt(id, 16), view: new DataView(bytes.buffer) };
		});
}

async function decodedFixture() {
	const parsed = parseMap(await fixture('club-racer-ecu.map.json'));
	if (!parsed.ok) throw new Error('fixture map does not parse');
	const { store } = await ingestCapture(await fixture('club-racer-session.csv'));
	const decoded = decodeChannels(store, compileMap(parsed.map));
	const channels = decoded.map((c) => ({ ...c.info, time: c.time, value: c.value }));
	// Times are seconds from the first frame in the store; the CSV's first row is the origin.
	return { channels };
}

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));

describe('derived channels over the demo capture, checked against DataView reads of the CSV', () => {
	// Bit layout from the demo map, read with docs/bit-numbering.md: a big-endian field with
	// startBit 8·(k+m−1) fills bytes k … k+m−1, so ManifoldPressure (start 40, 16 bits) is bytes 4–5
	// and EngineSpeed (start 8) bytes 0–1 of ID 0x5F0; OilPressure is little-endian bytes 0–1 of 0x5F2.
	const manifold = (v: DataView) => v.getUint16(4, false) * 0.1;
	const speed = (v: DataView) => v.getUint16(0, false);
	const oil = (v: DataView) => v.getUint16(0, true) * 0.1;

	it('boost = ManifoldPressure − 101.3, one sample per 0x5F0 frame', async () => {
		const rows = (await fixtureRows()).filter((r) => r.id === 0x5f0);
		const origin = (await fixtureRows())[0].time;
		const { channels } = await decodedFixture();
		const r = evaluateFormula('ManifoldPressure - 101.3', channels);
		if (!r.ok) throw new Error(r.problem.message);
		expect(r.series.time.length).toBe(rows.length);
		rows.forEach((row, i) => {
			expect(close(r.series.time[i], row.time - origin)).toBe(true);
			expect(close(r.series.value[i], manifold(row.view) - 101.3)).toBe(true);
		});
	});

	it('a formula over two frames holds each channel’s latest value at every time either is received', async () => {
		const all = await fixtureRows();
		const origin = all[0].time;
		// Walk the capture in order as a receiver would, keeping the latest reading of each.
		let lastSpeed: number | null = null;
		let lastOil: number | null = null;
		const expected = new Map<number, number>();
		for (const row of all) {
			if (row.id === 0x5f0) lastSpeed = speed(row.view);
			else if (row.id === 0x5f2) lastOil = oil(row.view);
			else continue;
			if (lastSpeed !== null && lastOil !== null)
				expected.set(row.time - origin, lastOil / Math.max(1, lastSpeed / 1000));
		}
		const { channels } = await decodedFixture();
		const r = evaluateFormula('OilPressure / max(1, EngineSpeed / 1000)', channels);
		if (!r.ok) throw new Error(r.problem.message);
		const times = [...expected.keys()];
		expect(r.series.time.length).toBe(times.length);
		times.forEach((t, i) => {
			expect(close(r.series.time[i], t)).toBe(true);
			expect(close(r.series.value[i], expected.get(t)!)).toBe(true);
		});
	});

	it('avg over 0.1 s is the mean of the samples in each trailing window (brute force reference)', async () => {
		const rows = (await fixtureRows()).filter((r) => r.id === 0x5f0);
		const origin = (await fixtureRows())[0].time;
		const samples = rows.map((r) => ({ t: r.time - origin, v: speed(r.view) }));
		const { channels } = await decodedFixture();
		const r = evaluateFormula('avg(EngineSpeed, 0.1)', channels);
		if (!r.ok) throw new Error(r.problem.message);
		samples.forEach(({ t }, i) => {
			const window = samples.filter((s) => s.t > t - 0.1 && s.t <= t);
			const mean = window.reduce((sum, s) => sum + s.v, 0) / window.length;
			expect(close(r.series.value[i], mean)).toBe(true);
		});
	});

	it('comparisons give 1 and 0', async () => {
		const rows = (await fixtureRows()).filter((r) => r.id === 0x5f0);
		const { channels } = await decodedFixture();
		const r = evaluateFormula('EngineSpeed > 4000', channels);
		if (!r.ok) throw new Error(r.problem.message);
		expect([...r.series.value]).toEqual(rows.map((row) => (speed(row.view) > 4000 ? 1 : 0)));
	});
});

describe('series functions against closed-form answers', () => {
	// x(t) = 3t + 1 on irregular times: its derivative is 3 everywhere, and the trapezoid rule is
	// exact for a straight line, so the running integral is 1.5(t² − t0²) + (t − t0) (calculus).
	const times = [0, 0.01, 0.025, 0.03, 0.07, 0.1, 0.13, 0.2, 0.31, 0.5];
	const ramp = {
		index: 0,
		frameName: 'F',
		signalName: 'x',
		time: Float64Array.from(times),
		value: Float64Array.from(times, (t) => 3 * t + 1)
	};
	const run = (
		formula: string,
		extra: (SampledChannel & { index: number; frameName: string; signalName: string })[] = []
	) => {
		const r = evaluateFormula(formula, [ramp, ...extra]);
		if (!r.ok) throw new Error(r.problem.message);
		return r.series;
	};

	it('ddt of a straight line is its slope; the first sample has no derivative', () => {
		const s = run('ddt(x)');
		expect([...s.time]).toEqual(times.slice(1));
		for (const v of s.value) expect(v).toBeCloseTo(3, 9);
	});

	it('integral of a straight line matches the closed form', () => {
		const s = run('integral(x)');
		s.time.forEach((t, i) => expect(s.value[i]).toBeCloseTo(1.5 * t * t + t, 9));
	});

	it('integral of a constant 2 over the capture is 2 × its length', () => {
		const s = run('integral(x * 0 + 2)');
		expect(s.value[s.value.length - 1]).toBeCloseTo(2 * 0.5, 12);
	});

	it('avg of a straight line sampled every 10 ms lags by the mean age of the samples in its window', () => {
		// A 0.095 s window (clear of the sample times) holds the ten samples t−0.09 … t; their mean
		// is x(t − 0.045) = x(t) − 3 × 0.045.
		const even = Array.from({ length: 50 }, (_, i) => i / 100);
		const line = {
			...ramp,
			time: Float64Array.from(even),
			value: Float64Array.from(even, (t) => 3 * t + 1)
		};
		const r = evaluateFormula('avg(x, 0.095)', [line]);
		if (!r.ok) throw new Error(r.problem.message);
		for (let i = 12; i < even.length; i++)
			expect(r.series.value[i]).toBeCloseTo(3 * even[i] + 1 - 0.135, 9);
	});

	it('division by zero leaves the sample out; the if form picks per sample', () => {
		const s = run('1 / (x - 1)');
		expect(s.time[0]).toBe(0.01); // x(0) = 1
		const pick = run('x > 1.5 ? 10 : -10');
		expect([...pick.value]).toEqual(times.map((t) => (3 * t + 1 > 1.5 ? 10 : -10)));
	});

	it('starts when every input has a sample, and holds the slower channel', () => {
		const late = {
			index: 1,
			frameName: 'F',
			signalName: 'y',
			time: Float64Array.from([0.1, 0.3]),
			value: Float64Array.from([100, 200])
		};
		const s = run('x + y', [late]);
		expect([...s.time]).toEqual([0.1, 0.13, 0.2, 0.3, 0.31, 0.5]);
		// At 0.3 s x still holds its 0.2 s value (1.6); y changed to 200.
		expect([...s.value].map((v) => Math.round(v * 1000) / 1000)).toEqual([
			101.3, 101.39, 101.6, 201.6, 201.93, 202.5
		]);
	});
});
