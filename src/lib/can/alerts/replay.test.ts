// Replaying the demo map's rules over the demo capture (both invented demo data). The expected
// events are computed here independently: the fixture's payload bytes read with ECMAScript
// DataView (little-endian u16 × 0.1 for oil pressure, u8 − 40 for coolant) and the alarm rules of
// ISA-18.2 / IEC 62682 (from memory) applied by hand: activation after the on-delay, a latched alarm
// stays until acknowledged, a non-latching one clears on return past the deadband. Node-only: reads files.
import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { compileMap } from '../decoder';
import { parseMap } from '../map-json';
import { decodeCapture } from '../capture/decode-capture';
import { ingestCapture } from '../capture/ingest';
import { replayAlertRules, UnknownRuleError } from './replay';

const fixture = (name: string) =>
	readFile(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');

async function load() {
	const parsed = parseMap(await fixture('club-racer-ecu.map.json'));
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
	const csv = await fixture('club-racer-session.csv');
	const { store } = await ingestCapture(csv);
	const decoded = decodeCapture(store, compileMap(parsed.map));
	// Reference series straight from the CSV text, times from the first frame like the capture's.
	const rows = csv
		.trim()
		.split('\n')
		.slice(1)
		.map((line) => line.split(','));
	const t0 = Number(rows[0][0]);
	const series = (id: string, read: (view: DataView) => number) =>
		rows
			.filter((r) => r[1] === id)
			.map((r) => {
				const bytes = Uint8Array.from(r[4].split(' '), (b) => Number.parseInt(b, 16));
				return { t: Number(r[0]) - t0, v: read(new DataView(bytes.buffer)) };
			});
	const oil = series('5F2', (d) => d.getUint16(0, true) * 0.1);
	const coolant = series('5F1', (d) => d.getUint8(0) - 40);
	return { map: parsed.map, decoded, oil, coolant, end: Number(rows.at(-1)![0]) - t0 };
}

/** First sample (at or after `from`) meeting `test`. */
const firstWhere = (
	s: { t: number; v: number }[],
	test: (v: number) => boolean,
	from = -Infinity
) => s.find((p) => p.t >= from && test(p.v))!;

describe('replayAlertRules over the demo capture', () => {
	it('finds the oil-pressure dip (latched) and the coolant climb (still active at the end)', async () => {
		const { map, decoded, oil, coolant, end } = await load();
		const replay = replayAlertRules(map, decoded.channels, decoded.duration);

		// Oil pressure low: below 250 kPa for 0.1 s, returns above 250 + 25 kPa, latching.
		const dip = firstWhere(oil, (v) => v < 250);
		const back = firstWhere(oil, (v) => v > 275, dip.t);
		const lowest = Math.min(...oil.map((p) => p.v));
		// Coolant hot: above 80 °C for 1 s; it never falls below 80 − 2 °C again.
		const hot = firstWhere(coolant, (v) => v > 80);
		expect(coolant.filter((p) => p.t > hot.t).every((p) => p.v > 78)).toBe(true);

		expect(decoded.duration).toBeCloseTo(end, 9);
		expect(
			replay.events.map((e) => ({
				...e,
				start: round(e.start),
				duration: round(e.duration),
				returnedAt: e.returnedAt === null ? null : round(e.returnedAt)
			}))
		).toEqual([
			{
				rule: 'coolant-hot',
				ruleName: 'Coolant hot',
				severity: 'advisory',
				channelIndex: expect.any(Number),
				start: round(hot.t + 1),
				end: null,
				duration: round(end - hot.t - 1),
				peak: Math.max(...coolant.map((p) => p.v)),
				latched: false,
				acknowledgedAt: null,
				returnedAt: null,
				message: 'Coolant hot: coolant at 85 °C, above 80 °C'
			},
			{
				rule: 'oil-pressure-low',
				ruleName: 'Oil pressure low',
				severity: 'critical',
				channelIndex: expect.any(Number),
				start: round(dip.t + 0.1),
				end: null,
				duration: round(end - dip.t - 0.1),
				peak: expect.closeTo(lowest, 9),
				latched: true,
				acknowledgedAt: null,
				returnedAt: round(back.t),
				message: `Oil pressure low: ${Number(lowest.toPrecision(6))} kPa, below 250 kPa`
			}
		]);
		expect(replay.summary.map((s) => [s.rule, s.count, s.latchedCount, s.openCount])).toEqual([
			['coolant-hot', 1, 0, 1],
			['oil-pressure-low', 1, 1, 1]
		]);
		expect(replay.rules.map((r) => [r.id, r.unit, r.channelIndex !== null])).toEqual([
			['coolant-hot', '°C', true],
			['oil-pressure-low', 'kPa', true]
		]);
	});

	it('an acknowledgement after the return clears the latched event at that time', async () => {
		const { map, decoded, oil } = await load();
		const back = firstWhere(oil, (v) => v > 275, firstWhere(oil, (v) => v < 250).t);
		const replay = replayAlertRules(map, decoded.channels, decoded.duration, [
			{ ruleId: 'oil-pressure-low', time: back.t + 2 }
		]);
		const event = replay.events.find((e) => e.rule === 'oil-pressure-low')!;
		expect(event).toMatchObject({ end: back.t + 2, acknowledgedAt: back.t + 2, latched: true });
		expect(replay.summary.find((s) => s.rule === 'oil-pressure-low')!.openCount).toBe(0);
	});

	it('lists a rule whose channel the map lacks without events, and lists rules without events with zero counts', async () => {
		const { map, decoded } = await load();
		const rules = [
			{ ...map.alertRules[0], id: 'ghost', name: 'Ghost', channel: { frame: 'Nope', signal: 'x' } },
			{ ...map.alertRules[0], id: 'never', name: 'Never', setpoint: 200 }
		];
		const replay = replayAlertRules({ alertRules: rules }, decoded.channels, decoded.duration);
		expect(replay.events).toEqual([]);
		expect(replay.rules.map((r) => r.channelIndex === null)).toEqual([true, false]);
		expect(replay.summary.map((s) => [s.rule, s.count, s.totalActiveS])).toEqual([
			['ghost', 0, 0],
			['never', 0, 0]
		]);
	});

	it('refuses an acknowledgement for a rule the map does not have, naming it', async () => {
		const { map, decoded } = await load();
		expect(() =>
			replayAlertRules(map, decoded.channels, decoded.duration, [
				{ ruleId: 'oil-pressure-low', time: 1 },
				{ ruleId: 'nope', time: 2 }
			])
		).toThrow(new UnknownRuleError(1, 'nope'));
	});
});

/** Times compared to the nanosecond: sums of CSV decimals carry float rounding. */
function round(t: number): number {
	return Math.round(t * 1e9) / 1e9;
}
