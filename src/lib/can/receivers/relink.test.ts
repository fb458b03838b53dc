import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { CanMap } from '../map';
import { parseMap } from '../map-json';
import { linkProfile } from './linking';
import { parseProfile } from './profile';
import { relinkProfile } from './relink';

const fixture = (name: string) =>
	readFileSync(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');

const parsedMap = parseMap(fixture('club-racer-ecu.map.json'));
const parsedProfile = parseProfile(fixture('dash-display.profile.json'));
if (!parsedMap.ok || !parsedProfile.ok) throw new Error('fixtures must parse');
const revisionA = parsedMap.map;
const profile = parsedProfile.value;
const links = linkProfile(profile, revisionA).links.map((l) => l.link);

/** Revision B: the club racer map after an invented firmware update. */
function revisionB(): CanMap {
	const b = structuredClone(revisionA);
	const frame = (name: string) => b.frames.find((f) => f.name === name)!;
	const signal = (f: string, s: string) => frame(f).signals.find((x) => x.name === s)!;
	signal('EngineCore', 'ThrottlePosition').name = 'ThrottleOpening'; // renamed, same bits
	Object.assign(signal('Pressures', 'OilPressure'), { scale: 0.001, unit: 'bar' }); // rescaled
	signal('EngineCore', 'Lambda').startBit = 48; // moved
	signal('EngineTemperatures', 'CoolantTemp').unit = 'V'; // now a raw sensor voltage
	frame('EngineTemperatures').name = 'EngineTemps'; // frame renamed, same ID
	const temps = frame('EngineTemps');
	temps.signals = temps.signals.filter((s) => s.name !== 'IntakeAirTemp'); // removed
	return b;
}

describe('relinkProfile', () => {
	const result = relinkProfile(profile, links, revisionA, revisionB());
	const item = (wanted: string) => result.items.find((i) => i.wanted === wanted)!;

	it('counts what revision B keeps, changes and breaks', () => {
		expect(result.counts).toEqual({ kept: 7, changed: 2, broken: 3 });
		expect(result.items.map((i) => i.wanted)).toEqual(links.map((l) => l.wanted));
	});

	it('keeps a link whose frame was only renamed, moving it to the new frame name', () => {
		expect(item('Oil temp')).toMatchObject({
			status: 'kept',
			after: { frame: 'EngineTemps', signal: 'OilTemp', id: 0x5f1 },
			message: '"Oil temp" keeps EngineTemperatures · OilTemp (frame now named "EngineTemps")'
		});
		expect(item('RPM')).toMatchObject({ status: 'kept', changes: [] });
	});

	it('a rescaled signal in a new unit is changed, with its new conversion and composed scale', () => {
		const oil = item('Oil pressure');
		expect(oil.status).toBe('changed');
		expect(oil.changes).toEqual([
			{ field: 'scale', from: 0.1, to: 0.001 },
			{ field: 'unit', from: 'kPa', to: 'bar' }
		]);
		expect(oil.after?.conversion).toMatchObject({ kind: 'identity', from: 'bar', to: 'bar' });
		// Before: 0.1 kPa/bit = 0.001 bar/bit (1 bar = 100 kPa, NIST SP 811 B.8); after: 0.001 bar/bit.
		expect(oil.scaling.before?.scale).toBeCloseTo(0.001, 15);
		expect(oil.scaling.after?.scale).toBe(0.001);
	});

	it('a moved signal is changed: the device must read other bits', () => {
		expect(item('AFR')).toMatchObject({
			status: 'changed',
			changes: [{ field: 'startBit', from: 56, to: 48 }],
			message: expect.stringContaining('changed startBit 56 → 48')
		});
	});

	it('a renamed signal is broken, and the new name on the same bits is suggested', () => {
		const tps = item('TPS');
		expect(tps.status).toBe('broken');
		expect(tps.after).toBeNull();
		expect(tps.suggestion).toMatchObject({ frame: 'EngineCore', signal: 'ThrottleOpening' });
		expect(tps.message).toBe(
			'EngineCore · ThrottlePosition is not in "Club racer engine controller" any more (removed or renamed); EngineCore · ThrottleOpening is new and sits on the same bits of the same frame (start bit 24, 16 bits): probably "ThrottlePosition" renamed'
		);
	});

	it('a removed signal is broken without a suggestion', () => {
		expect(item('IAT')).toMatchObject({
			status: 'broken',
			suggestion: null,
			message: expect.stringContaining('no signal of the new revision looks like it')
		});
	});

	it('a signal whose new unit no longer converts is broken, saying why', () => {
		expect(item('ECT')).toMatchObject({
			status: 'broken',
			message:
				'EngineTemperatures · CoolantTemp now has unit "V", which does not give "ECT" its °C: "V" measures voltage and "°C" measures temperature; they do not convert'
		});
	});

	it('the same revision keeps every link', () => {
		const same = relinkProfile(profile, links, revisionA, revisionA);
		expect(same.counts).toEqual({ kept: links.length, changed: 0, broken: 0 });
		expect(same.items.map((i) => i.after)).toEqual(links);
	});
});
