import { createReadStream, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { replayAlertRules } from '../alerts/replay';
import { alertRuleSchema } from '../alerts/rule';
import { decodeCapture } from '../capture/decode-capture';
import { ingestCapture } from '../capture/ingest';
import { compileMap } from '../decoder';
import { canMapSchema } from '../map';
import { parseMap } from '../map-json';
import { checkOnCapture } from './check';
import { deviceChannels, replayDeviceAlerts, type CaptureChannel } from './device-alerts';
import { linkProfile } from './linking';
import { parseProfile, receiverProfileSchema } from './profile';

// A one-frame map and profile (invented), and channels built sample by sample in each test.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Check map',
	frames: [
		{
			name: 'Engine',
			id: '0x100',
			cycleMs: 20,
			signals: [
				{ name: 'CoolantTemp', startBit: 0, length: 8, offset: -40, unit: '°C' },
				{ name: 'OilPressure', startBit: 8, length: 16, scale: 0.1, unit: 'kPa' },
				{ name: 'Gear', startBit: 24, length: 4 }
			]
		}
	]
});
const profile = receiverProfileSchema.parse({
	format: 'framewright-profile@1',
	name: 'Check display',
	kind: 'display',
	wanted: [
		{ name: 'Coolant temp', quantity: 'temperature', unit: '°F', min: 100, max: 250 },
		{ name: 'Oil pressure', quantity: 'pressure', unit: 'bar', min: 0, max: 8, decimals: 1 },
		{ name: 'Gear', quantity: 'count' },
		{ name: 'Fuel level', quantity: 'percent', unit: '%', required: true }
	]
});
const links = linkProfile(profile, map).links.map((l) => l.link);

function channel(signalName: string, time: number[], value: number[]): CaptureChannel {
	return {
		info: { index: 0, frameName: 'Engine', signalName, unit: '' },
		time: Float64Array.from(time),
		value: Float64Array.from(value)
	};
}
const every = (ms: number, n: number) => Array.from({ length: n }, (_, i) => (i * ms) / 1000);

function lines(channels: CaptureChannel[], wanted: string) {
	return checkOnCapture(profile, map, links, channels).channels.find((c) => c.wanted === wanted)!;
}

describe('checkOnCapture', () => {
	it('links the three it can and reports the unlinked required channel as a failure', () => {
		expect(links.map((l) => l.wanted)).toEqual(['Coolant temp', 'Oil pressure', 'Gear']);
		const fuel = lines([], 'Fuel level');
		expect(fuel.status).toBe('fail');
		expect(fuel.lines[0].sentence).toBe(
			'Fuel level is not linked — the device gets nothing for it, and it is required; link it to a signal first'
		);
	});

	it('no samples: says the controller sends nothing, or that the frame arrives without the signal', () => {
		expect(lines([], 'Oil pressure').lines).toEqual([
			{
				check: 'samples',
				status: 'fail',
				sentence:
					'no samples for Oil pressure — the controller sends nothing for it in this recording (no Engine frames decoded); check the sensor input and that the controller broadcasts Engine'
			}
		]);
		const frameOnly = [
			channel('CoolantTemp', [0, 0.02], [80, 80]),
			channel('OilPressure', [0, 0.02], [NaN, NaN])
		];
		expect(lines(frameOnly, 'Oil pressure').lines[0].sentence).toMatch(
			/^no samples for Oil pressure — frame Engine arrives but OilPressure is never in it/
		);
	});

	it('update interval: as the map says, slower than its cycle time, or with a dropout', () => {
		const steady = every(20, 50);
		expect(
			lines(
				[
					channel(
						'OilPressure',
						steady,
						steady.map(() => 300)
					)
				],
				'Oil pressure'
			).lines[1]
		).toEqual({
			check: 'interval',
			status: 'pass',
			sentence: 'Oil pressure updates about every 20 ms, matching the 20 ms cycle time of Engine'
		});
		const slow = every(100, 50);
		expect(
			lines(
				[
					channel(
						'OilPressure',
						slow,
						slow.map(() => 300)
					)
				],
				'Oil pressure'
			).lines[1]
		).toMatchObject({
			status: 'warning',
			sentence: expect.stringMatching(
				/^Oil pressure updates about every 100 ms, slower than the 20 ms cycle time/
			)
		});
		const gap = [...every(20, 30), ...every(20, 30).map((t) => t + 2)];
		expect(
			lines(
				[
					channel(
						'OilPressure',
						gap,
						gap.map(() => 300)
					)
				],
				'Oil pressure'
			).lines[1]
		).toMatchObject({
			status: 'warning',
			sentence: expect.stringContaining('once went 1420 ms without a sample')
		});
	});

	it('share outside the display range is counted in the device unit', () => {
		// Oil 0…8 bar: 900 kPa = 9 bar (NIST SP 811 B.8: 1 bar = 100 kPa) is outside, 700 kPa inside.
		const t = every(20, 10);
		const kPa = [700, 700, 900, 700, 900, 700, 700, 700, 900, 700];
		const check = lines([channel('OilPressure', t, kPa)], 'Oil pressure');
		expect(check.outsideShare).toBeCloseTo(0.3, 12);
		expect(check.lines[2]).toEqual({
			check: 'range',
			status: 'warning',
			sentence:
				'30 % of Oil pressure samples lie outside the display range 0…8 bar (lowest 7.0 bar, highest 9.0 bar) — the device will sit at its end stop; widen the range or check the sensor and the conversion'
		});
		// Coolant 100…250 °F: 40 °C = 104 °F is inside (t/°F = 1.8 t/°C + 32, NIST SP 811).
		const coolant = lines(
			[
				channel(
					'CoolantTemp',
					t,
					t.map(() => 40)
				)
			],
			'Coolant temp'
		);
		expect(coolant.outsideShare).toBe(0);
	});

	it('a value that never moves is flagged as stuck, except a state or count', () => {
		const t = every(500, 10); // 4.5 s
		const coolant = lines(
			[
				channel(
					'CoolantTemp',
					t,
					t.map(() => 85)
				)
			],
			'Coolant temp'
		);
		expect(coolant.lines.find((l) => l.check === 'stuck')).toEqual({
			check: 'stuck',
			status: 'warning',
			sentence:
				'Coolant temp shows 185 °F throughout (10 samples over 4.5 s) — a stuck or disconnected sensor, or a value the controller holds; check it moves when it should'
		});
		const gear = lines(
			[
				channel(
					'Gear',
					t,
					t.map(() => 3)
				)
			],
			'Gear'
		);
		expect(gear.lines.find((l) => l.check === 'stuck')?.status).toBe('pass');
		const moving = lines(
			[
				channel(
					'CoolantTemp',
					t,
					t.map((_, i) => 80 + i)
				)
			],
			'Coolant temp'
		);
		expect(moving.lines.some((l) => l.check === 'stuck')).toBe(false);
	});

	it('a link to a signal the revision no longer has fails the check', () => {
		const stale = [{ ...links[0], signal: 'CoolantTemperature' }];
		const result = checkOnCapture(profile, map, stale, []);
		expect(result.channels[0].lines[0].sentence).toBe(
			'Coolant temp is linked to Engine · CoolantTemperature, which this map revision does not have; relink it'
		);
	});
});

describe('on the demo capture', () => {
	const fixture = (name: string) => new URL(`../../../../fixtures/${name}`, import.meta.url);

	async function demo() {
		const m = parseMap(readFileSync(fixture('club-racer-ecu.map.json'), 'utf8'));
		const p = parseProfile(readFileSync(fixture('dash-display.profile.json'), 'utf8'));
		if (!m.ok || !p.ok) throw new Error('fixtures must parse');
		const imported = await ingestCapture(createReadStream(fixture('club-racer-session.csv')));
		const decoded = decodeCapture(imported.store, compileMap(m.map));
		const demoLinks = linkProfile(p.value, m.map).links.map((l) => l.link);
		return { map: m.map, profile: p.value, links: demoLinks, decoded };
	}

	it('the dash display gets every linked channel at the rate the map says', async () => {
		const { map: m, profile: p, links: l, decoded } = await demo();
		const result = checkOnCapture(p, m, l, decoded.channels);
		const rpm = result.channels.find((c) => c.wanted === 'RPM')!;
		// The session was recorded with EngineCore every 10 ms (capture/fixtures.test.ts measures it).
		expect(rpm.medianIntervalMs).toBeCloseTo(10, 0);
		expect(rpm.lines.map((x) => x.check)).toEqual(['samples', 'interval', 'range']);
		for (const c of result.channels.filter((x) => x.wanted !== 'Fuel level'))
			expect(c.samples, c.wanted).toBeGreaterThan(0);
		expect(result.channels.find((c) => c.wanted === 'Fuel level')!.status).toBe('warning');
	});

	it('device alerts in bar fire when the map-unit rule in kPa fires (1 bar = 100 kPa, NIST SP 811 B.8)', async () => {
		const { profile: p, links: l, decoded } = await demo();
		const deviceProfile = {
			...p,
			alertRules: [
				{
					...p.alertRules[0],
					setpoint: 2.2,
					deadband: 0.1,
					onDelayS: 0,
					latching: false
				}
			]
		};
		const device = replayDeviceAlerts(deviceProfile, l, decoded.channels, decoded.duration);
		const inKpa = alertRuleSchema.parse({
			id: 'kpa',
			name: 'kPa twin',
			channel: { frame: 'Pressures', signal: 'OilPressure' },
			severity: 'critical',
			condition: 'below',
			setpoint: 220,
			deadband: 10
		});
		const reference = replayAlertRules({ alertRules: [inKpa] }, decoded.channels, decoded.duration);
		expect(reference.events.length).toBeGreaterThan(0); // the session's oil-pressure dip
		expect(device.events.map((e) => [e.start, e.end])).toEqual(
			reference.events.map((e) => [e.start, e.end])
		);
		expect(device.events[0].message).toMatch(/^Oil pressure low: \d+(\.\d+)? bar, below 2\.2 bar$/);
		const oil = deviceChannels(deviceProfile, l, decoded.channels).find(
			(c) => c.info.signalName === 'Oil pressure'
		)!;
		expect(oil.info.unit).toBe('bar');
	});
});
