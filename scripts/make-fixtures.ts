/**
 * Writes the demo fixtures: two invented maps and two captures recorded from an invented scenario.
 *   fixtures/club-racer-ecu.map.json   a club race car's engine controller, 500 kbit/s, 11-bit IDs
 *   fixtures/club-racer-session.csv    ~60 s: three laps, coolant warming up, one oil-pressure dip,
 *                                      plus two IDs the map does not define
 *   fixtures/genset-j1939.map.json     a J1939 engine on a generator set, 250 kbit/s
 *   fixtures/genset-idle.csv           ~30 s at governed speed, DM1 as a single frame and via BAM
 * Deterministic (seeded random numbers): running it twice gives identical files.
 * Demo data only — never a check value. Run: npx tsx scripts/make-fixtures.ts
 */
import { writeFileSync } from 'node:fs';
import { encodeSignal } from '../src/lib/can/codec';
import {
	buildJ1939Id,
	encodeDm1,
	PGN_DM1,
	PGN_TP_CM,
	PGN_TP_DT,
	TP_CM_BAM,
	TP_DT_BYTES,
	type Dm1Lamps,
	type TroubleCode
} from '../src/lib/can/j1939';
import { canMapSchema, type CanMap, type CanMapInput } from '../src/lib/can/map';
import { serializeMap } from '../src/lib/can/map-json';
import { seededRandom } from '../src/lib/can/testing/seeded-random';
import { CANONICAL_HEADER } from '../src/lib/can/capture/layout';

const OUT = new URL('../fixtures/', import.meta.url);

// ------------------------------------------------------------------------------------------------
// Maps

const clubRacer: CanMapInput = {
	format: 'framewright-map@1',
	name: 'Club racer engine controller',
	bitrate: 500_000,
	frames: [
		{
			name: 'EngineCore',
			id: '0x5F0',
			cycleMs: 10,
			sender: 'ECU',
			comment: 'Fast engine values, big-endian 16-bit fields.',
			signals: [
				{
					name: 'EngineSpeed',
					startBit: 8,
					length: 16,
					byteOrder: 'big',
					unit: 'rpm',
					min: 0,
					max: 10000
				},
				{
					name: 'ThrottlePosition',
					startBit: 24,
					length: 16,
					byteOrder: 'big',
					scale: 0.1,
					unit: '%',
					min: 0,
					max: 100
				},
				{
					name: 'ManifoldPressure',
					startBit: 40,
					length: 16,
					byteOrder: 'big',
					scale: 0.1,
					unit: 'kPa',
					min: 10,
					max: 110
				},
				{
					name: 'Lambda',
					startBit: 56,
					length: 16,
					byteOrder: 'big',
					scale: 0.001,
					unit: 'λ',
					min: 0.7,
					max: 1.3
				}
			]
		},
		{
			name: 'EngineTemperatures',
			id: '0x5F1',
			cycleMs: 100,
			sender: 'ECU',
			signals: [
				{ name: 'CoolantTemp', startBit: 0, length: 8, offset: -40, unit: '°C', min: 60, max: 105 },
				{ name: 'OilTemp', startBit: 8, length: 8, offset: -40, unit: '°C', min: 50, max: 130 },
				{
					name: 'IntakeAirTemp',
					startBit: 16,
					length: 8,
					offset: -40,
					unit: '°C',
					min: -20,
					max: 60
				},
				{
					name: 'BatteryVoltage',
					startBit: 32,
					length: 16,
					scale: 0.01,
					unit: 'V',
					min: 12,
					max: 15
				}
			]
		},
		{
			name: 'Pressures',
			id: '0x5F2',
			cycleMs: 20,
			sender: 'ECU',
			comment: 'Little-endian fields, two of them not byte-aligned.',
			signals: [
				{
					name: 'OilPressure',
					startBit: 0,
					length: 16,
					scale: 0.1,
					unit: 'kPa',
					min: 200,
					max: 800
				},
				{
					name: 'FuelPressure',
					startBit: 16,
					length: 16,
					scale: 0.1,
					unit: 'kPa',
					min: 350,
					max: 450
				},
				{
					name: 'IgnitionAdvance',
					startBit: 32,
					length: 10,
					valueType: 'signed',
					scale: 0.5,
					unit: '°',
					min: -10,
					max: 50
				},
				{ name: 'KnockLevel', startBit: 42, length: 6, unit: '', min: 0, max: 40 }
			]
		},
		{
			name: 'Drivetrain',
			id: '0x5F3',
			cycleMs: 50,
			sender: 'ECU',
			signals: [
				{ name: 'Gear', startBit: 0, length: 4, labels: { '0': 'neutral', '15': 'reverse' } },
				{ name: 'LaunchActive', startBit: 4, length: 1, labels: { '0': 'off', '1': 'on' } },
				{
					name: 'VehicleSpeed',
					startBit: 8,
					length: 16,
					scale: 0.01,
					unit: 'km/h',
					min: 0,
					max: 280
				}
			]
		},
		{
			name: 'StatusPaged',
			id: '0x600',
			cycleMs: 100,
			sender: 'ECU',
			comment: 'Byte 0 selects the page; pages alternate.',
			signals: [
				{ name: 'Page', startBit: 0, length: 8, multiplexer: true },
				{
					name: 'EcuTemp',
					startBit: 8,
					length: 8,
					offset: -40,
					unit: '°C',
					muxValue: 0,
					min: -20,
					max: 85
				},
				{
					name: 'SensorSupply',
					startBit: 16,
					length: 16,
					scale: 0.001,
					unit: 'V',
					muxValue: 0,
					min: 4.9,
					max: 5.1
				},
				{ name: 'FuelUsed', startBit: 8, length: 16, scale: 0.01, unit: 'L', muxValue: 1 },
				{ name: 'LapCount', startBit: 24, length: 8, unit: '', muxValue: 1 }
			]
		},
		{
			name: 'ChassisMotion',
			id: '0x610',
			cycleMs: 20,
			sender: 'ECU',
			signals: [
				{
					name: 'LateralAccel',
					startBit: 8,
					length: 16,
					byteOrder: 'big',
					valueType: 'signed',
					scale: 0.001,
					unit: 'g',
					min: -2.5,
					max: 2.5
				},
				{
					name: 'LongitudinalAccel',
					startBit: 24,
					length: 16,
					byteOrder: 'big',
					valueType: 'signed',
					scale: 0.001,
					unit: 'g',
					min: -2.5,
					max: 2.5
				},
				{
					name: 'SteeringAngle',
					startBit: 40,
					length: 16,
					byteOrder: 'big',
					valueType: 'signed',
					scale: 0.1,
					unit: '°',
					min: -540,
					max: 540
				}
			]
		}
	]
};

// J1939 positions and resolutions below are from SAE J1939-71 as recalled (from memory).
const genset: CanMapInput = {
	format: 'framewright-map@1',
	name: 'Generator set engine (J1939)',
	bitrate: 250_000,
	frames: [
		{
			name: 'EEC1',
			id: '0x0CF00400',
			extended: true,
			j1939: true,
			cycleMs: 20,
			sender: 'Engine',
			comment: 'Electronic engine controller 1, PGN 61444.',
			signals: [
				{ name: 'DriverDemandTorque', startBit: 8, length: 8, offset: -125, unit: '%', spn: 512 },
				{ name: 'ActualEngineTorque', startBit: 16, length: 8, offset: -125, unit: '%', spn: 513 },
				{
					name: 'EngineSpeed',
					startBit: 24,
					length: 16,
					scale: 0.125,
					unit: 'rpm',
					min: 0,
					max: 2000,
					spn: 190
				}
			]
		},
		{
			name: 'ET1',
			id: '0x18FEEE00',
			extended: true,
			j1939: true,
			cycleMs: 1000,
			sender: 'Engine',
			comment: 'Engine temperature 1, PGN 65262.',
			signals: [
				{
					name: 'CoolantTemp',
					startBit: 0,
					length: 8,
					offset: -40,
					unit: '°C',
					min: 0,
					max: 105,
					spn: 110
				},
				{ name: 'FuelTemp', startBit: 8, length: 8, offset: -40, unit: '°C', spn: 174 },
				{
					name: 'OilTemp',
					startBit: 16,
					length: 16,
					scale: 0.03125,
					offset: -273,
					unit: '°C',
					min: 0,
					max: 125,
					spn: 175
				}
			]
		},
		{
			name: 'EFLP1',
			id: '0x18FEEF00',
			extended: true,
			j1939: true,
			cycleMs: 500,
			sender: 'Engine',
			comment: 'Engine fluid level/pressure 1, PGN 65263.',
			signals: [
				{ name: 'FuelDeliveryPressure', startBit: 0, length: 8, scale: 4, unit: 'kPa', spn: 94 },
				{
					name: 'OilLevel',
					startBit: 16,
					length: 8,
					scale: 0.4,
					unit: '%',
					min: 50,
					max: 100,
					spn: 98
				},
				{
					name: 'OilPressure',
					startBit: 24,
					length: 8,
					scale: 4,
					unit: 'kPa',
					min: 200,
					max: 700,
					spn: 100
				},
				{
					name: 'CoolantLevel',
					startBit: 56,
					length: 8,
					scale: 0.4,
					unit: '%',
					min: 60,
					max: 100,
					spn: 111
				}
			]
		},
		{
			name: 'VEP1',
			id: '0x18FEF700',
			extended: true,
			j1939: true,
			cycleMs: 1000,
			sender: 'Engine',
			comment: 'Vehicle electrical power 1, PGN 65271.',
			signals: [
				{
					name: 'BatteryPotential',
					startBit: 40,
					length: 16,
					scale: 0.05,
					unit: 'V',
					min: 22,
					max: 30,
					spn: 168
				}
			]
		},
		{
			name: 'DM1',
			id: '0x18FECA00',
			extended: true,
			j1939: true,
			cycleMs: 1000,
			sender: 'Engine',
			comment: 'Active trouble codes, PGN 65226 (SAE J1939-73). More than one code arrives by BAM.',
			signals: [
				{ name: 'ProtectLamp', startBit: 0, length: 2, labels: { '0': 'off', '1': 'on' } },
				{ name: 'AmberWarningLamp', startBit: 2, length: 2, labels: { '0': 'off', '1': 'on' } },
				{ name: 'RedStopLamp', startBit: 4, length: 2, labels: { '0': 'off', '1': 'on' } },
				{ name: 'MalfunctionLamp', startBit: 6, length: 2, labels: { '0': 'off', '1': 'on' } }
			]
		}
	]
};

// ------------------------------------------------------------------------------------------------
// Capture writing

interface Row {
	time: number;
	id: number;
	extended: boolean;
	data: Uint8Array;
}

const hex2 = (b: number) => b.toString(16).toUpperCase().padStart(2, '0');

function writeCapture(name: string, rows: Row[]): void {
	rows.sort((a, b) => a.time - b.time);
	const lines = [CANONICAL_HEADER];
	for (const r of rows) {
		const id = r.id
			.toString(16)
			.toUpperCase()
			.padStart(r.extended ? 8 : 3, '0');
		lines.push(
			`${r.time.toFixed(6)},${id},${r.extended ? 1 : 0},${r.data.length},${Array.from(r.data, hex2).join(' ')}`
		);
	}
	writeFileSync(new URL(name, OUT), `${lines.join('\n')}\n`);
	console.log(`${name}: ${rows.length} frames`);
}

/** Encodes physical values by signal name into a frame payload of the map. */
function payload(
	map: CanMap,
	frameName: string,
	values: Record<string, number>,
	fill = 0
): Uint8Array {
	const frame = map.frames.find((f) => f.name === frameName)!;
	const data = new Uint8Array(frame.length).fill(fill);
	for (const [signalName, value] of Object.entries(values)) {
		const signal = frame.signals.find((s) => s.name === signalName);
		if (!signal) throw new Error(`${frameName} has no signal ${signalName}`);
		encodeSignal(signal, value, data);
	}
	return data;
}

/** Periodic send times with a little timing jitter, as a real controller shows. */
function schedule(
	rand: () => number,
	periodS: number,
	duration: number,
	phase: number,
	jitterS: number
): number[] {
	const times: number[] = [];
	for (let t = phase; t < duration; t += periodS)
		times.push(Math.max(0, t + (rand() - 0.5) * 2 * jitterS));
	return times;
}

const smooth = (x: number) => x * x * (3 - 2 * x); // smoothstep 0…1

// ------------------------------------------------------------------------------------------------
// Club racer session: three 20 s laps

function clubRacerSession(map: CanMap): Row[] {
	const rand = seededRandom(0x5eed01);
	const noise = (amplitude: number) => (rand.next() - 0.5) * 2 * amplitude;
	const DURATION = 60;
	const LAP = 20;
	// A lap: pull through gears 2–5 on the straight (10 s), brake, a long corner in 3rd (6 s), exit in 3rd/4th.
	const GEAR_RATIO_KMH_PER_KRPM: Record<number, number> = { 2: 11.5, 3: 15.5, 4: 19.5, 5: 23.5 };
	function state(t: number) {
		const p = t % LAP;
		let gear: number;
		let rpm: number;
		let throttle: number;
		let lateral: number;
		let steering: number;
		let longitudinal: number;
		if (p < 10) {
			gear = 2 + Math.min(3, Math.floor(p / 2.5));
			const x = (p % 2.5) / 2.5;
			rpm = gear === 5 ? 5600 + 1900 * Math.min(1, x * 1.2) : 5400 + 2400 * x; // shift near 7800
			throttle = 100;
			longitudinal = 0.45 - 0.07 * gear;
			lateral = 0.05 * Math.sin(p);
			steering = 3 * Math.sin(p * 0.7);
		} else if (p < 12) {
			gear = p < 11 ? 4 : 3;
			const x = (p - 10) / 2;
			rpm = 7300 - 2600 * smooth(x);
			throttle = 0;
			longitudinal = -1.25;
			lateral = 0.3 * x;
			steering = 40 * x;
		} else if (p < 18) {
			gear = 3;
			const x = (p - 12) / 6;
			rpm = 4700 + 900 * x;
			throttle = 35 + 25 * x;
			longitudinal = 0.1;
			lateral = 1.35 * Math.sin(Math.PI * Math.min(1, x * 1.1));
			steering = 95 * Math.sin(Math.PI * Math.min(1, x * 1.1));
		} else {
			gear = 3;
			const x = (p - 18) / 2;
			rpm = 5600 + 1800 * x;
			throttle = 100;
			longitudinal = 0.35;
			lateral = 0.3 * (1 - x);
			steering = 20 * (1 - x);
		}
		rpm += noise(15);
		const speed = (rpm / 1000) * GEAR_RATIO_KMH_PER_KRPM[gear];
		const manifold = 28 + 0.72 * throttle + noise(0.4);
		const lambda =
			throttle > 90 ? 0.875 + noise(0.008) : throttle < 5 ? 1.05 + noise(0.02) : 0.98 + noise(0.01);
		// Oil pressure rises with engine speed; in the long corner of lap 3 (t ≈ 52.5–54 s) the
		// sump surges and pressure dips — the kind of event a limit alert exists to catch.
		let oil = 180 + 0.06 * rpm + noise(4);
		if (t > 52.5 && t < 54) oil -= (oil - 120) * 0.85 * Math.sin((Math.PI * (t - 52.5)) / 1.5);
		const warm = 1 - Math.exp(-t / 35);
		return {
			gear,
			rpm,
			throttle,
			speed,
			manifold,
			lambda,
			oil,
			coolant: 68 + 21 * warm,
			oilTemp: 78 + 17 * warm,
			intake: 31 + 6 * warm + noise(0.4),
			battery: 13.9 + noise(0.05) - (throttle > 90 ? 0.1 : 0),
			fuel: 400 + noise(3) - throttle * 0.05,
			ignition: throttle > 90 ? 24 + rpm / 1000 : 32 - throttle / 10,
			knock: Math.max(0, Math.round(3 + noise(3) + (throttle > 90 && rpm > 7000 ? 6 : 0))),
			lateral: lateral + noise(0.02),
			longitudinal: longitudinal + noise(0.02),
			steering: steering + noise(0.3)
		};
	}

	const rows: Row[] = [];
	const add = (
		frameName: string,
		id: number,
		period: number,
		phase: number,
		values: (t: number) => Record<string, number>
	) => {
		for (const time of schedule(rand.next, period, DURATION, phase, 0.0002)) {
			rows.push({ time, id, extended: false, data: payload(map, frameName, values(time)) });
		}
	};
	add('EngineCore', 0x5f0, 0.01, 0.0011, (t) => {
		const s = state(t);
		return {
			EngineSpeed: s.rpm,
			ThrottlePosition: s.throttle,
			ManifoldPressure: s.manifold,
			Lambda: s.lambda
		};
	});
	add('EngineTemperatures', 0x5f1, 0.1, 0.0032, (t) => {
		const s = state(t);
		return {
			CoolantTemp: s.coolant,
			OilTemp: s.oilTemp,
			IntakeAirTemp: s.intake,
			BatteryVoltage: s.battery
		};
	});
	add('Pressures', 0x5f2, 0.02, 0.0045, (t) => {
		const s = state(t);
		return {
			OilPressure: s.oil,
			FuelPressure: s.fuel,
			IgnitionAdvance: s.ignition,
			KnockLevel: s.knock
		};
	});
	add('Drivetrain', 0x5f3, 0.05, 0.0063, (t) => {
		const s = state(t);
		return { Gear: s.gear, LaunchActive: 0, VehicleSpeed: s.speed };
	});
	let page = 0;
	let fuelUsed = 1.2;
	add('StatusPaged', 0x600, 0.1, 0.0078, (t): Record<string, number> => {
		page ^= 1;
		fuelUsed += 0.0045 * (state(t).throttle / 100 + 0.1);
		return page === 0
			? {
					Page: 0,
					EcuTemp: 41 + 6 * (t / DURATION),
					SensorSupply: 5.002 + (rand.next() - 0.5) * 0.004
				}
			: { Page: 1, FuelUsed: fuelUsed, LapCount: Math.floor(t / LAP) + 1 };
	});
	add('ChassisMotion', 0x610, 0.02, 0.0091, (t) => {
		const s = state(t);
		return {
			LateralAccel: s.lateral,
			LongitudinalAccel: s.longitudinal,
			SteeringAngle: s.steering
		};
	});

	// Two IDs the map does not define: a dash display's button/counter frame and a logger heartbeat.
	let counter = 0;
	for (const time of schedule(rand.next, 0.05, DURATION, 0.0123, 0.0003)) {
		counter = (counter + 1) & 0x0f;
		const buttons = time % 20 > 9.8 && time % 20 < 10.2 ? 0x02 : 0x00;
		rows.push({
			time,
			id: 0x5f8,
			extended: false,
			data: Uint8Array.of(counter, buttons, 0x00, 0x64)
		});
	}
	for (const time of schedule(rand.next, 0.1, DURATION, 0.0456, 0.0005)) {
		const seconds = Math.floor(time);
		rows.push({
			time,
			id: 0x640,
			extended: false,
			data: Uint8Array.of(0xa5, seconds & 0xff, (seconds >> 8) & 0xff, 0, 0, 0)
		});
	}
	return rows;
}

// ------------------------------------------------------------------------------------------------
// Generator set at governed idle

function gensetIdle(map: CanMap): Row[] {
	const rand = seededRandom(0x5eed02);
	const noise = (amplitude: number) => (rand.next() - 0.5) * 2 * amplitude;
	const DURATION = 30;
	const ENGINE = 0x00;
	const rows: Row[] = [];
	const id = (frameName: string) => map.frames.find((f) => f.name === frameName)!.id;
	const add = (
		frameName: string,
		period: number,
		phase: number,
		values: (t: number) => Record<string, number>
	) => {
		for (const time of schedule(rand.next, period, DURATION, phase, 0.0003)) {
			// J1939-71: bytes a parameter group leaves unused are sent as 0xFF (from memory).
			rows.push({
				time,
				id: id(frameName),
				extended: true,
				data: payload(map, frameName, values(time), 0xff)
			});
		}
	};
	// A four-pole alternator at 50 Hz runs at 1500 rpm (speed = 120·f / poles).
	add('EEC1', 0.02, 0.002, (t) => ({
		DriverDemandTorque: 32 + noise(1),
		ActualEngineTorque: 30 + 4 * Math.sin(t * 0.8) + noise(1),
		EngineSpeed: 1500 + 3 * Math.sin(t * 2.1) + noise(1.5)
	}));
	add('ET1', 1, 0.11, (t) => ({
		CoolantTemp: 78 + t * 0.05,
		FuelTemp: 36,
		OilTemp: 86 + t * 0.03
	}));
	add('EFLP1', 0.5, 0.23, (t) => ({
		FuelDeliveryPressure: 380,
		OilLevel: 82,
		// Oil pressure sags after 10 s — the fault the DM1 reports.
		OilPressure: t < 10 ? 420 + noise(8) : 190 + noise(8),
		CoolantLevel: t < 20 ? 88 : 52
	}));
	add('VEP1', 1, 0.37, () => ({ BatteryPotential: 27.6 + noise(0.1) }));

	// DM1 every second (SAE J1939-73): no fault, then one code in a single frame, then two codes by BAM.
	const off = { state: 'off', flash: 'none' } as const;
	const amber = { state: 'on', flash: 'none' } as const;
	const lamps = (warning: boolean): Dm1Lamps => ({
		malfunctionIndicator: off,
		redStop: off,
		amberWarning: warning ? amber : off,
		protect: off
	});
	// SPN 100 engine oil pressure and SPN 111 coolant level; FMI 18 = data valid but below normal
	// operating range, moderately severe (SAE J1939-73, from memory).
	const oilLow: TroubleCode = { spn: 100, fmi: 18, occurrenceCount: 1, conversionMethod: 0 };
	const coolantLow: TroubleCode = { spn: 111, fmi: 18, occurrenceCount: 1, conversionMethod: 0 };
	const dm1Id = buildJ1939Id({ priority: 6, pgn: PGN_DM1, sourceAddress: ENGINE });
	const cmId = buildJ1939Id({
		priority: 7,
		pgn: PGN_TP_CM,
		sourceAddress: ENGINE,
		destinationAddress: 0xff
	});
	const dtId = buildJ1939Id({
		priority: 7,
		pgn: PGN_TP_DT,
		sourceAddress: ENGINE,
		destinationAddress: 0xff
	});
	for (let second = 0; second < DURATION; second++) {
		const time = second + 0.5 + noise(0.0005);
		if (second < 20) {
			const codes = second < 10 ? [] : [{ ...oilLow, occurrenceCount: 1 }];
			rows.push({
				time,
				id: dm1Id,
				extended: true,
				data: encodeDm1(lamps(codes.length > 0), codes)
			});
			continue;
		}
		// BAM (SAE J1939-21): announce size, packet count and PGN, then 7-byte packets 50 ms apart.
		const message = encodeDm1(lamps(true), [oilLow, coolantLow]);
		const packets = Math.ceil(message.length / TP_DT_BYTES);
		const pgn = PGN_DM1;
		rows.push({
			time,
			id: cmId,
			extended: true,
			data: Uint8Array.of(
				TP_CM_BAM,
				message.length & 0xff,
				message.length >> 8,
				packets,
				0xff,
				pgn & 0xff,
				(pgn >> 8) & 0xff,
				pgn >> 16
			)
		});
		for (let k = 0; k < packets; k++) {
			const data = new Uint8Array(8).fill(0xff);
			data[0] = k + 1;
			data.set(message.subarray(k * TP_DT_BYTES, (k + 1) * TP_DT_BYTES), 1);
			rows.push({ time: time + 0.05 * (k + 1), id: dtId, extended: true, data });
		}
	}

	// Proprietary B frames (PGN 0xFF10, 0xFF11) from the generator controller at SA 0x27, not in the map.
	for (const time of schedule(rand.next, 0.1, DURATION, 0.051, 0.0004)) {
		const volts = Math.round(4000 + noise(20)); // 400.0 V in 0.1 V
		rows.push({
			time,
			id: buildJ1939Id({ priority: 6, pgn: 0xff10, sourceAddress: 0x27 }),
			extended: true,
			data: Uint8Array.of(volts & 0xff, volts >> 8, 0xf4, 0x01, 0xff, 0xff, 0xff, 0xff)
		});
	}
	for (const time of schedule(rand.next, 0.25, DURATION, 0.077, 0.0004)) {
		const kw = Math.round(1100 + 80 * Math.sin(time * 0.5) + noise(5));
		rows.push({
			time,
			id: buildJ1939Id({ priority: 6, pgn: 0xff11, sourceAddress: 0x27 }),
			extended: true,
			data: Uint8Array.of(kw & 0xff, kw >> 8, 0x01, 0xff, 0xff, 0xff, 0xff, 0xff)
		});
	}
	return rows;
}

// ------------------------------------------------------------------------------------------------

function writeMap(name: string, input: CanMapInput): CanMap {
	const map = canMapSchema.parse(input);
	writeFileSync(new URL(name, OUT), serializeMap(map));
	console.log(`${name}: ${map.frames.length} frames`);
	return map;
}

const clubMap = writeMap('club-racer-ecu.map.json', clubRacer);
writeCapture('club-racer-session.csv', clubRacerSession(clubMap));
const gensetMap = writeMap('genset-j1939.map.json', genset);
writeCapture('genset-idle.csv', gensetIdle(gensetMap));
