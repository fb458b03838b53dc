import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeFrame, decodeSignal } from '../codec';
import { j1939Pgn } from '../j1939';
import { canMapSchema, type CanMap, type Signal } from '../map';
import { parseMap } from '../map-json';
import { linkProfile, type Link } from './linking';
import { parseProfile, receiverProfileSchema, type ReceiverProfile } from './profile';
import {
	buildReceiveSet,
	receiveSetSchema,
	serializeReceiveSet,
	type ReceiveChannel,
	type ReceiveSet
} from './receive-set';

const fixture = (name: string) =>
	readFileSync(new URL(`../../../../fixtures/${name}`, import.meta.url), 'utf8');

function load(mapFile: string, profileFile: string) {
	const map = parseMap(fixture(mapFile));
	const profile = parseProfile(fixture(profileFile));
	if (!map.ok || !profile.ok) throw new Error('fixtures must parse');
	const report = linkProfile(profile.value, map.map);
	const links = report.links.map((l) => l.link);
	const built = buildReceiveSet(profile.value, map.map, links);
	if (!built.ok) throw new Error(JSON.stringify(built.problems));
	return { map: map.map, profile: profile.value, links, set: built.receiveSet };
}

/** Capture rows read with a plain split (independent of the importer). */
function captureRows(name: string) {
	return fixture(name)
		.trim()
		.split('\n')
		.slice(1)
		.map((line) => {
			const [, id, , , data] = line.split(',');
			return {
				id: Number.parseInt(id, 16),
				data: Uint8Array.from(data.split(' '), (h) => Number.parseInt(h, 16))
			};
		});
}

/** The device's side: read the entry's bit field with the codec and apply the composed scaling. */
function deviceValue(entry: ReceiveChannel, data: Uint8Array): number {
	const signal: Signal = {
		name: entry.name,
		startBit: entry.startBit,
		length: entry.length,
		byteOrder: entry.byteOrder,
		valueType: entry.valueType,
		scale: entry.scale,
		offset: entry.offset,
		unit: entry.unit,
		min: null,
		max: null,
		labels: {},
		multiplexer: false,
		muxValue: null,
		spn: null,
		role: 'value',
		comment: ''
	};
	const value = decodeSignal(signal, data).value;
	return entry.form === 'linear' ? value : 1 / value;
}

/** The entries a received frame feeds: same ID, or for J1939 entries the same PGN. */
function matches(entry: ReceiveChannel, id: number): boolean {
	return entry.j1939 ? j1939Pgn(entry.id) === j1939Pgn(id) : entry.id === id;
}

function compareOverCapture(
	map: CanMap,
	set: ReceiveSet,
	capture: string,
	afterwards: Record<string, (physical: number) => number>
) {
	let compared = 0;
	for (const row of captureRows(capture)) {
		for (const entry of set.channels) {
			if (!matches(entry, row.id)) continue;
			const frame = map.frames.find((f) => f.name === entry.frame)!;
			const index = frame.signals.findIndex((s) => s.name === entry.signal);
			const decoded = decodeFrame(frame, row.data)[index];
			if (!decoded.present) continue;
			const expected = afterwards[entry.name](decoded.value);
			expect(Math.abs(deviceValue(entry, row.data) - expected), entry.name).toBeLessThanOrEqual(
				1e-9 * (1 + Math.abs(expected))
			);
			compared++;
		}
	}
	return compared;
}

describe('receive set of the demo profiles', () => {
	it('dash display: bit layout from the map, scale/offset composed with kPa → bar and λ → AFR', () => {
		const { set } = load('club-racer-ecu.map.json', 'dash-display.profile.json');
		expect(set).toMatchObject({
			format: 'framewright-receive@1',
			profile: 'Club dash display',
			kind: 'display',
			map: 'Club racer engine controller',
			revision: null,
			bitrate: 500000,
			unlinked: [{ name: 'Fuel level', required: false }]
		});
		const by = Object.fromEntries(set.channels.map((c) => [c.name, c]));
		expect(by.RPM).toMatchObject({
			id: 0x5f0,
			extended: false,
			j1939: false,
			startBit: 8,
			length: 16,
			byteOrder: 'big',
			valueType: 'unsigned',
			form: 'linear',
			scale: 1,
			offset: 0,
			unit: 'rpm',
			min: 0,
			max: 9000,
			cycleMs: 10,
			multiplexer: null
		});
		// 0.1 kPa/bit and 1 bar = 100 kPa (NIST SP 811 B.8): 0.001 bar/bit.
		expect(by['Oil pressure'].scale).toBeCloseTo(0.001, 15);
		// 0.001 λ/bit × 14.7 (gasoline, common practice): 0.0147 AFR/bit.
		expect(by.AFR).toMatchObject({ form: 'linear', offset: 0, decimals: 1 });
		expect(by.AFR.scale).toBeCloseTo(0.0147, 15);
		expect(by.ECT.offset).toBe(-40);
	});

	it('decoding the club racer session through the receive set equals map decode + conversion', () => {
		const { map, set } = load('club-racer-ecu.map.json', 'dash-display.profile.json');
		const same = (x: number) => x;
		const compared = compareOverCapture(map, set, 'club-racer-session.csv', {
			RPM: same,
			ECT: same,
			'Oil pressure': (kPa) => kPa / 100, // NIST SP 811 B.8: 1 bar = 100 kPa
			'Oil temp': same,
			AFR: (lambda) => lambda * 14.7, // gasoline, common practice
			TPS: same,
			MAP: same,
			IAT: same,
			VBat: same,
			Speed: same,
			Gear: same,
			'Det count': same
		});
		expect(compared).toBeGreaterThan(10_000);
	});

	it('decoding the genset capture through the receive set (J1939, by PGN) equals map decode + °F/psi', () => {
		const { map, set } = load('genset-j1939.map.json', 'genset-panel.profile.json');
		const same = (x: number) => x;
		// NIST SP 811 (2008): t/°F = 1.8 t/°C + 32. psi from the exact definitions of the pound
		// (0.45359237 kg), standard gravity (9.80665 m/s²) and the inch (0.0254 m); B.8 rounds it to 6.894757 kPa.
		const toF = (c: number) => 1.8 * c + 32;
		const psiInKpa = (0.45359237 * 9.80665) / 0.0254 ** 2 / 1000;
		const compared = compareOverCapture(map, set, 'genset-idle.csv', {
			'Engine speed': same,
			'Coolant temperature': toF,
			'Oil pressure': (kPa) => kPa / psiInKpa,
			'Oil temperature': toF,
			Battery: same,
			'Coolant level': same,
			'Red stop lamp': same
		});
		expect(compared).toBeGreaterThan(1000);
		expect(set.channels.every((c) => c.extended && c.j1939)).toBe(true);
	});

	it('serialises IDs as hex and parses back through the schema', () => {
		const { set } = load('genset-j1939.map.json', 'genset-panel.profile.json');
		const text = serializeReceiveSet(set);
		const document = JSON.parse(text);
		expect(document.channels[0].id).toBe('0x0CF00400');
		expect(receiveSetSchema.parse(document)).toEqual(set);
	});
});

describe('buildReceiveSet', () => {
	const map = canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'Paged test map',
		frames: [
			{
				name: 'Paged',
				id: '0x600',
				signals: [
					{ name: 'Page', startBit: 0, length: 8, multiplexer: true },
					{ name: 'BoardTemp', startBit: 8, length: 8, offset: -40, unit: '°C', muxValue: 2 },
					{ name: 'Phi', startBit: 16, length: 16, scale: 0.001, unit: 'φ' }
				]
			}
		]
	});
	const profile: ReceiverProfile = receiverProfileSchema.parse({
		format: 'framewright-profile@1',
		name: 'Test logger',
		kind: 'logger',
		wanted: [
			{ name: 'ECU temp', quantity: 'temperature', unit: '°F' },
			{ name: 'AFR', quantity: 'air-fuel-ratio', unit: 'AFR', fuel: 'gasoline' }
		],
		manualLinks: [{ wanted: 'ECU temp', frame: 'Paged', signal: 'BoardTemp' }]
	});
	const links = (): Link[] => linkProfile(profile, map).links.map((l) => l.link);

	it('carries the multiplexer a paged signal needs', () => {
		const built = buildReceiveSet(profile, map, links());
		expect(built.ok && built.receiveSet.channels[0].multiplexer).toEqual({
			startBit: 0,
			length: 8,
			byteOrder: 'little',
			value: 2
		});
	});

	it('marks a φ signal shown as AFR as reciprocal: value = 1 / (raw × scale + offset)', () => {
		const built = buildReceiveSet(profile, map, links());
		const afr = built.ok ? built.receiveSet.channels[1] : null;
		expect(afr).toMatchObject({ signal: 'Phi', form: 'reciprocal', offset: 0 });
		// raw 800 → φ 0.8 → AFR 14.7 / 0.8 (gasoline, common practice).
		expect(1 / (800 * afr!.scale + afr!.offset)).toBeCloseTo(14.7 / 0.8, 10);
	});

	it('refuses links the revision no longer holds, and conversions from a unit the signal left', () => {
		const [temp, afr] = links();
		const built = buildReceiveSet(profile, map, [
			{ ...temp, signal: 'BoardTemperature' },
			{ ...afr, conversion: { ...afr.conversion, from: 'λ' } }
		]);
		expect(built).toEqual({
			ok: false,
			problems: [
				{
					wanted: 'ECU temp',
					path: '[0].signal',
					message:
						'map "Paged test map" no longer has Paged · BoardTemperature (ID 0x600); relink "ECU temp"'
				},
				{
					wanted: 'AFR',
					path: '[1].conversion',
					message: 'the link of "AFR" converts from "λ" but Paged · Phi is now in "φ"; relink it'
				}
			]
		});
	});
});
