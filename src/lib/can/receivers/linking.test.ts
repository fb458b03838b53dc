import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { canMapSchema, type CanMap } from '../map';
import { parseMap } from '../map-json';
import { linkProfile, missingRequired, rankCandidates } from './linking';
import {
	parseProfile,
	receiverProfileSchema,
	wantedChannelSchema,
	type WantedChannelInput
} from './profile';

/** A map with each signal in a frame of its own (so two signals may share a name). */
function mapOf(signals: [name: string, unit: string][]): CanMap {
	return canMapSchema.parse({
		format: 'framewright-map@1',
		name: 'Invented test map',
		frames: signals.map(([name, unit], i) => ({
			name: `F${i}`,
			id: 0x100 + i,
			signals: [{ name, startBit: 0, length: 16, unit }]
		}))
	});
}

function profileOf(...wanted: WantedChannelInput[]) {
	return receiverProfileSchema.parse({
		format: 'framewright-profile@1',
		name: 'Invented test device',
		kind: 'display',
		wanted
	});
}

type Row = [
	wanted: string,
	quantity: WantedChannelInput['quantity'],
	unit: string,
	signals: [string, string][],
	expected: string | null,
	fuel?: WantedChannelInput['fuel']
];

// Invented names in the styles the trade writes them (our own test data, not from any product).
// Traps: two temperature signals, percentages that are not a throttle, units that do not convert.
const TABLE: Row[] = [
	[
		'RPM',
		'rotational-speed',
		'rpm',
		[
			['EngineSpeed', 'rpm'],
			['VehicleSpeed', 'km/h']
		],
		'EngineSpeed'
	],
	['Engine RPM', 'rotational-speed', 'rpm', [['EngSpd', 'rpm']], 'EngSpd'],
	[
		'Tacho',
		'rotational-speed',
		'rpm',
		[
			['Engine_Speed', 'rpm'],
			['WheelSpeedFL', 'km/h']
		],
		'Engine_Speed'
	],
	[
		'ECT',
		'temperature',
		'°C',
		[
			['CoolantTemp', '°C'],
			['OilTemp', '°C']
		],
		'CoolantTemp'
	],
	[
		'CLT',
		'temperature',
		'°F',
		[
			['coolant_temperature', 'degC'],
			['oil_temperature', 'degC']
		],
		'coolant_temperature'
	],
	[
		'Water temp',
		'temperature',
		'°C',
		[
			['ECT', '°C'],
			['EOT', '°C']
		],
		'ECT'
	],
	[
		'Temperature',
		'temperature',
		'°C',
		[
			['CoolantTemp', '°C'],
			['OilTemp', '°C']
		],
		null
	],
	['Oil temp', 'temperature', '°C', [['CoolantTemp', '°C']], null],
	[
		'Oil temperature',
		'temperature',
		'°F',
		[
			['EngOilTemp', '°C'],
			['TransOilTemp', '°C']
		],
		'EngOilTemp'
	],
	[
		'Coolant temp gauge',
		'temperature',
		'°C',
		[
			['CoolantTemp', '°C'],
			['CoolantTempRaw', 'V']
		],
		'CoolantTemp'
	],
	[
		'TPS',
		'percent',
		'%',
		[
			['ThrottlePos', '%'],
			['FuelLevel', '%']
		],
		'ThrottlePos'
	],
	[
		'Throttle',
		'percent',
		'%',
		[
			['OilLevel', '%'],
			['InjectorDuty', '%']
		],
		null
	],
	[
		'TPS',
		'percent',
		'%',
		[
			['PedalPosition', '%'],
			['BoostDuty', '%']
		],
		null
	],
	['Throttle', 'percent', '%', [['Throttle', '']], null],
	[
		'Boost duty',
		'percent',
		'%',
		[
			['WastegateDuty', '%'],
			['ThrottlePosition', '%']
		],
		null
	],
	[
		'Engine load',
		'percent',
		'%',
		[
			['Load', '%'],
			['ThrottlePosition', '%']
		],
		'Load'
	],
	[
		'MAP',
		'pressure',
		'kPa',
		[
			['ManifoldAbsPressure', 'kPa'],
			['BaroPressure', 'kPa']
		],
		'ManifoldAbsPressure'
	],
	['Boost', 'pressure', 'psi', [['ManifoldPressure', 'kPa']], null],
	[
		'IAT',
		'temperature',
		'°C',
		[
			['IntakeAirTemp', '°C'],
			['AmbientTemp', '°C']
		],
		'IntakeAirTemp'
	],
	[
		'Air temp',
		'temperature',
		'°C',
		[
			['IAT', '°C'],
			['EGT', '°C']
		],
		'IAT'
	],
	[
		'EGT',
		'temperature',
		'°C',
		[
			['ExhaustTemp1', '°C'],
			['CoolantTemp', '°C']
		],
		'ExhaustTemp1'
	],
	['AFR', 'air-fuel-ratio', 'AFR', [['Lambda1', 'λ']], 'Lambda1', 'gasoline'],
	['Lambda', 'lambda', 'λ', [['AirFuelRatio', 'AFR']], 'AirFuelRatio', 'e85'],
	['Lambda', 'lambda', 'λ', [['AirFuelRatio', 'AFR']], null], // AFR → λ needs a fuel
	['Equivalence ratio', 'equivalence-ratio', 'φ', [['Lambda', 'λ']], 'Lambda'],
	['Mixture', 'air-fuel-ratio', 'AFR', [['Phi', 'φ']], 'Phi', 'methanol'],
	[
		'Oil pressure',
		'pressure',
		'bar',
		[
			['OilP', 'kPa'],
			['FuelP', 'kPa']
		],
		'OilP'
	],
	[
		'Oil press',
		'pressure',
		'psi',
		[
			['EOP', 'kPa'],
			['FuelPressure', 'kPa']
		],
		'EOP'
	],
	['Oil pressure', 'pressure', 'psi', [['OilTemp', '°C']], null],
	[
		'Oil pressure',
		'pressure',
		'kPa',
		[
			['OilPressure', 'kPa'],
			['OilPressure', 'kPa']
		],
		null
	],
	[
		'Fuel pressure',
		'pressure',
		'kPa',
		[
			['FuelRailPressure', 'kPa'],
			['OilPressure', 'kPa']
		],
		'FuelRailPressure'
	],
	[
		'VBat',
		'voltage',
		'V',
		[
			['BatteryVoltage', 'V'],
			['SensorSupply5V', 'V']
		],
		'BatteryVoltage'
	],
	['Battery', 'voltage', 'V', [['SupplyVoltage', 'V']], 'SupplyVoltage'],
	['Supply voltage', 'voltage', 'mV', [['VBatt', 'V']], 'VBatt'],
	[
		'Sensor supply',
		'voltage',
		'V',
		[
			['BatteryVoltage', 'V'],
			['Vref', 'V']
		],
		'Vref'
	],
	[
		'Speed',
		'speed',
		'mph',
		[
			['VehicleSpeed', 'km/h'],
			['EngineSpeed', 'rpm']
		],
		'VehicleSpeed'
	],
	[
		'Road speed',
		'speed',
		'km/h',
		[
			['VSS', 'km/h'],
			['WheelSpeedRR', 'km/h']
		],
		'VSS'
	],
	[
		'Wheel speed FL',
		'speed',
		'km/h',
		[
			['WheelSpeedFL', 'km/h'],
			['WheelSpeedFR', 'km/h']
		],
		'WheelSpeedFL'
	],
	[
		'Gear',
		'count',
		'',
		[
			['GearPosition', ''],
			['GearRatio', '']
		],
		'GearPosition'
	],
	[
		'Ign timing',
		'angle',
		'°',
		[
			['IgnitionAdvance', '°'],
			['SteeringAngle', '°']
		],
		'IgnitionAdvance'
	],
	[
		'Steering',
		'angle',
		'deg',
		[
			['SteeringWheelAngle', '°'],
			['IgnitionAngle', '°']
		],
		'SteeringWheelAngle'
	],
	[
		'Lat G',
		'acceleration',
		'g',
		[
			['LateralAccel', 'g'],
			['LongitudinalAccel', 'g']
		],
		'LateralAccel'
	],
	[
		'Long G',
		'acceleration',
		'm/s²',
		[
			['LongAccel', 'g'],
			['LatAccel', 'g']
		],
		'LongAccel'
	],
	[
		'Fuel level',
		'percent',
		'%',
		[
			['FuelUsed', 'L'],
			['TankLevel', '%']
		],
		'TankLevel'
	],
	[
		'Fuel level',
		'percent',
		'%',
		[
			['FuelUsed', 'L'],
			['FuelPressure', 'kPa']
		],
		null
	],
	['Fuel used', 'volume', 'L', [['FuelConsumed', 'L']], 'FuelConsumed'],
	[
		'Fuel flow',
		'volume-flow',
		'L/h',
		[
			['FuelRate', 'L/h'],
			['FuelUsed', 'L']
		],
		'FuelRate'
	],
	[
		'Lap',
		'count',
		'',
		[
			['LapCount', ''],
			['LapTime', 's']
		],
		'LapCount'
	],
	[
		'Hours',
		'time',
		'h',
		[
			['EngineHours', 'h'],
			['TripTime', 's']
		],
		'EngineHours'
	],
	[
		'Knock',
		'count',
		'',
		[
			['KnockLevel', ''],
			['KnockRetard', '°']
		],
		'KnockLevel'
	]
];

describe('linking: invented wanted-channel / signal names', () => {
	it(`the table has at least 40 rows (${TABLE.length})`, () => {
		expect(TABLE.length).toBeGreaterThanOrEqual(40);
	});

	it.each(TABLE)(
		'"%s" (%s, %s) among %j → %s',
		(wanted, quantity, unit, signals, expected, fuel) => {
			const report = linkProfile(
				profileOf({ name: wanted, quantity, unit, fuel: fuel ?? null }),
				mapOf(signals)
			);
			expect(report.problems).toEqual([]);
			if (expected === null) {
				expect(report.links).toEqual([]);
				expect(report.unlinked).toHaveLength(1);
				expect(report.unlinked[0].reason).not.toBe('');
			} else {
				expect(report.links.map((l) => l.link.signal)).toEqual([expected]);
				expect(report.links[0].link.confidence).toBeGreaterThanOrEqual(0.6);
			}
		}
	);
});

describe('linkProfile', () => {
	const engineMap = mapOf([
		['CoolantTemp', '°C'],
		['OilTemp', '°C'],
		['OilPressure', 'kPa'],
		['Lambda', 'λ']
	]);

	it('links each signal to one wanted channel: the clearer match wins, the other is told why', () => {
		const report = linkProfile(
			profileOf(
				{ name: 'ECT', quantity: 'temperature', unit: '°C' },
				{ name: 'Coolant temperature', quantity: 'temperature', unit: '°F' }
			),
			engineMap
		);
		// "Coolant temperature" = "CoolantTemp" exactly (1 × 0.98 for °C → °F) beats "ECT" (0.95).
		expect(report.links.map((l) => [l.wanted, l.link.signal])).toEqual([
			['Coolant temperature', 'CoolantTemp']
		]);
		expect(report.unlinked).toEqual([
			expect.objectContaining({
				wanted: 'ECT',
				reason: 'every matching signal already feeds another wanted channel (F0 · CoolantTemp)'
			})
		]);
		const shared = linkProfile(
			profileOf(
				{ name: 'ECT', quantity: 'temperature', unit: '°C' },
				{ name: 'Coolant temperature', quantity: 'temperature', unit: '°F' }
			),
			engineMap,
			{ allowShared: true }
		);
		expect(shared.links.map((l) => l.link.signal)).toEqual(['CoolantTemp', 'CoolantTemp']);
	});

	it('gives each link a score, a reason and the conversion it needs', () => {
		const report = linkProfile(
			profileOf({ name: 'Oil pressure', quantity: 'pressure', unit: 'psi' }),
			engineMap
		);
		const [linked] = report.links;
		expect(linked.link).toMatchObject({
			wanted: 'Oil pressure',
			frame: 'F2',
			id: 0x102,
			extended: false,
			signal: 'OilPressure',
			confidence: 0.98,
			manual: false,
			conversion: { kind: 'units', from: 'kPa', to: 'psi', form: 'linear', offset: 0 }
		});
		// NIST SP 811 B.8: 1 psi = 6.894757 kPa, so kPa → psi is its inverse.
		expect(linked.link.conversion.scale).toBeCloseTo(1 / 6.894757, 7);
		expect(linked.reason).toBe(
			'"Oil pressure" and "OilPressure" are the same name once normalised (oil pressure); kPa → psi: × 0.145038'
		);
	});

	it('keeps links made by hand, even where the name would not match', () => {
		const report = linkProfile(
			{
				...profileOf({ name: 'Det', quantity: 'temperature', unit: '°C' }),
				manualLinks: [{ wanted: 'Det', frame: 'F1', signal: 'OilTemp' }]
			},
			engineMap
		);
		expect(report.links[0]).toMatchObject({
			wanted: 'Det',
			link: { signal: 'OilTemp', manual: true, confidence: 1 },
			reason: 'linked by hand; °C → °C: no conversion'
		});
	});

	it('a unitless signal takes its quantity from its name, by hand as automatically', () => {
		const unitless = mapOf([['Lambda', '']]);
		const wanted = {
			name: 'Mix',
			quantity: 'air-fuel-ratio',
			unit: 'AFR',
			fuel: 'gasoline'
		} as const;
		const report = linkProfile(
			{ ...profileOf(wanted), manualLinks: [{ wanted: 'Mix', frame: 'F0', signal: 'Lambda' }] },
			unitless
		);
		// λ → AFR: × 14.7 for gasoline (common practice).
		expect(report.links[0].link.conversion).toMatchObject({ kind: 'mixture', scale: 14.7 });
		expect(linkProfile(profileOf({ ...wanted, name: 'AFR' }), unitless).links).toHaveLength(1);
	});

	it('a hand-made link to a signal the revision no longer has is a clear problem, not a guess', () => {
		const report = linkProfile(
			{
				...profileOf({ name: 'ECT', quantity: 'temperature', unit: '°C', required: true }),
				manualLinks: [{ wanted: 'ECT', frame: 'F0', signal: 'CoolantTemperature' }]
			},
			engineMap
		);
		expect(report.problems).toEqual([
			{
				wanted: 'ECT',
				path: 'manualLinks[0].signal',
				message:
					'frame "F0" of map "Invented test map" has no signal "CoolantTemperature" (removed or renamed?), so "ECT" cannot link to it'
			}
		]);
		expect(report.links).toEqual([]);
		expect(missingRequired(report).map((u) => u.wanted)).toEqual(['ECT']);
	});

	it('a hand-made link between units that do not convert is refused with both units named', () => {
		const report = linkProfile(
			{
				...profileOf({ name: 'Oil pressure', quantity: 'pressure', unit: 'psi' }),
				manualLinks: [{ wanted: 'Oil pressure', frame: 'F1', signal: 'OilTemp' }]
			},
			engineMap
		);
		expect(report.problems[0].message).toBe(
			'cannot link "Oil pressure" (psi) to F1 · OilTemp (°C): "°C" measures temperature and "psi" measures pressure; they do not convert'
		);
	});

	it('lists well-named signals whose units do not convert, so a person sees why they were not taken', () => {
		const candidates = rankCandidates(
			wantedChannelSchema.parse({
				name: 'Coolant temp',
				quantity: 'pressure',
				unit: 'kPa'
			}),
			engineMap
		);
		// OilPressure converts but is another thing (oil pressure ≠ coolant temperature): not listed.
		expect(candidates.map((c) => c.signal)).toEqual(['CoolantTemp']);
		expect(candidates[0]).toMatchObject({
			score: 0,
			nameScore: 1,
			problem: '"°C" measures temperature and "kPa" measures pressure; they do not convert'
		});
	});

	it('a workspace extends the synonyms: "Wet temp" links once the workspace says it is coolant', () => {
		const profile = profileOf({ name: 'Wet temp', quantity: 'temperature', unit: '°C' });
		expect(linkProfile(profile, engineMap).links).toEqual([]);
		const extended = linkProfile(profile, engineMap, {
			synonyms: { concepts: [{ id: 'coolant-temperature', names: ['wet temp'] }] }
		});
		expect(extended.links.map((l) => l.link.signal)).toEqual(['CoolantTemp']);
		expect(extended.links[0].reason).toMatch(/are synonyms for coolant temperature/);
	});
});

describe('the demo profiles link to the demo maps', () => {
	const load = (map: string, profile: string) => {
		const m = parseMap(
			readFileSync(new URL(`../../../../fixtures/${map}`, import.meta.url), 'utf8')
		);
		const p = parseProfile(
			readFileSync(new URL(`../../../../fixtures/${profile}`, import.meta.url), 'utf8')
		);
		if (!m.ok || !p.ok) throw new Error('fixtures must parse');
		return linkProfile(p.value, m.map);
	};

	it('dash display on the club racer: automatic links, one by hand, kPa → bar and λ → AFR', () => {
		const report = load('club-racer-ecu.map.json', 'dash-display.profile.json');
		const by = Object.fromEntries(report.links.map((l) => [l.wanted, l.link]));
		expect(report.problems).toEqual([]);
		expect(by['Det count']).toMatchObject({ signal: 'KnockLevel', manual: true });
		expect(report.links.filter((l) => !l.link.manual)).toHaveLength(11);
		expect(by['Oil pressure'].conversion).toMatchObject({ kind: 'units', from: 'kPa', to: 'bar' });
		expect(by['Oil pressure'].conversion.scale).toBeCloseTo(0.01, 12); // 1 bar = 100 kPa (NIST B.8)
		expect(by.AFR).toMatchObject({
			signal: 'Lambda',
			conversion: { kind: 'mixture', fuel: 'gasoline', scale: 14.7 } // common practice
		});
		expect(report.unlinked.map((u) => [u.wanted, u.required])).toEqual([['Fuel level', false]]);
		expect(missingRequired(report)).toEqual([]);
	});

	it('generator-set panel on the J1939 engine: °C → °F and kPa → psi, two channels unlinked', () => {
		const report = load('genset-j1939.map.json', 'genset-panel.profile.json');
		const by = Object.fromEntries(report.links.map((l) => [l.wanted, l.link]));
		expect(by['Coolant temperature']).toMatchObject({
			signal: 'CoolantTemp',
			conversion: { scale: 1.8, offset: 32 } // NIST SP 811: t/°F = 1.8 t/°C + 32
		});
		expect(by['Oil pressure']).toMatchObject({ signal: 'OilPressure', conversion: { to: 'psi' } });
		expect(by.Battery.signal).toBe('BatteryPotential');
		expect(report.unlinked.map((u) => u.wanted)).toEqual(['Fuel level', 'Engine hours']);
	});
});
