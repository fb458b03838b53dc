import { describe, expect, it } from 'vitest';
import { decodeSignal, encodeSignal } from './codec';
import { compileMap, SIGNAL_STATUS } from './decoder';
import { buildJ1939Id, encodeDm1, j1939ValueStatus, parseDm1, parseJ1939Id } from './j1939';
import { canMapSchema } from './map';

describe('parseJ1939Id (SAE J1939-21 29-bit identifier layout)', () => {
	it.each([
		// SAE J1939-21: request PGN 59904 (0xEA00), PDU1, sent to global (0xFF) by SA 0.
		{ id: 0x18eaff00, priority: 6, pgn: 0xea00, pf: 0xea, ps: 0xff, sa: 0x00, da: 0xff },
		// SAE J1939-71 EEC1 (electronic engine controller 1), PGN 61444 = 0xF004, priority 3, engine SA 0.
		{ id: 0x0cf00400, priority: 3, pgn: 61444, pf: 0xf0, ps: 0x04, sa: 0x00, da: null },
		// SAE J1939-71 ET1 (engine temperature 1), PGN 65262 = 0xFEEE, priority 6.
		{ id: 0x18feee00, priority: 6, pgn: 65262, pf: 0xfe, ps: 0xee, sa: 0x00, da: null },
		// SAE J1939-73 DM1, PGN 65226 = 0xFECA, priority 6, from SA 0x03 (transmission, from memory).
		{ id: 0x18feca03, priority: 6, pgn: 0xfeca, pf: 0xfe, ps: 0xca, sa: 0x03, da: null },
		// SAE J1939-21 TP.CM, PGN 0xEC00 (PDU1), to 0x21 from 0xF9.
		{ id: 0x1cec21f9, priority: 7, pgn: 0xec00, pf: 0xec, ps: 0x21, sa: 0xf9, da: 0x21 }
	])('ID $id → priority $priority, PGN $pgn', ({ id, priority, pgn, pf, ps, sa, da }) => {
		const parsed = parseJ1939Id(id);
		expect(parsed).toMatchObject({
			priority,
			pgn,
			pf,
			ps,
			sourceAddress: sa,
			destinationAddress: da
		});
		expect(parsed.edp).toBe(0);
		expect(parsed.dp).toBe(0);
		// build is the inverse of parse
		expect(buildJ1939Id({ priority, pgn, sourceAddress: sa, destinationAddress: da })).toBe(id);
	});

	it('reads EDP and DP (SAE J1939-21: bits 25 and 24) into the 18-bit PGN', () => {
		// Constructed by the bit layout: priority 7, EDP 1, DP 1, PF 0xFF, PS 0x12, SA 0x34.
		const id = (7 << 26) | (1 << 25) | (1 << 24) | (0xff << 16) | (0x12 << 8) | 0x34;
		const parsed = parseJ1939Id(id >>> 0);
		expect(parsed).toMatchObject({ priority: 7, edp: 1, dp: 1, pgn: 0x3ff12, sourceAddress: 0x34 });
		expect(buildJ1939Id({ priority: 7, pgn: 0x3ff12, sourceAddress: 0x34 })).toBe(0x1fff1234);
	});

	it('round-trips every priority, PF and a spread of PS/SA through build and parse', () => {
		let checked = 0;
		for (let priority = 0; priority < 8; priority++) {
			for (let pf = 0; pf < 256; pf += 7) {
				for (const dp of [0, 1]) {
					const ps = (pf * 31) & 0xff;
					const sa = (pf * 17 + priority) & 0xff;
					const id = priority * 0x4000000 + dp * 0x1000000 + pf * 0x10000 + ps * 0x100 + sa;
					const p = parseJ1939Id(id);
					expect(buildJ1939Id(p)).toBe(id);
					checked++;
				}
			}
		}
		expect(checked).toBe(8 * 37 * 2);
	});

	it('rejects IDs outside 29 bits and malformed build parts with clear messages', () => {
		expect(() => parseJ1939Id(0x20000000)).toThrow(/0x1FFFFFFF/);
		expect(() => parseJ1939Id(-1)).toThrow(RangeError);
		expect(() => buildJ1939Id({ priority: 8, pgn: 0xf004, sourceAddress: 0 })).toThrow(/priority/);
		expect(() => buildJ1939Id({ priority: 3, pgn: 0xea12, sourceAddress: 0 })).toThrow(/low byte/);
		expect(() =>
			buildJ1939Id({ priority: 3, pgn: 0xf004, sourceAddress: 0, destinationAddress: 5 })
		).toThrow(/PDU2/);
		expect(() => buildJ1939Id({ priority: 3, pgn: 0xf004, sourceAddress: 256 })).toThrow(
			/source address/
		);
	});

	it('a PDU1 PGN without destination goes to the global address 0xFF (SAE J1939-21)', () => {
		expect(buildJ1939Id({ priority: 6, pgn: 0xea00, sourceAddress: 0xf9 })).toBe(0x18eafff9);
	});
});

describe('j1939ValueStatus (SAE J1939-71 parameter ranges, recalled from memory)', () => {
	it.each([
		// 1-byte parameters: 0–250 valid, 251 parameter-specific, 252–253 reserved, 254 error, 255 n/a.
		[0, 8, 'valid'],
		[250, 8, 'valid'],
		[251, 8, 'reserved'],
		[253, 8, 'reserved'],
		[254, 8, 'error'],
		[255, 8, 'notAvailable'],
		// 2-byte parameters: 0x0000–0xFAFF valid, 0xFE00–0xFEFF error, 0xFF00–0xFFFF n/a.
		[0xfaff, 16, 'valid'],
		[0xfb00, 16, 'reserved'],
		[0xfdff, 16, 'reserved'],
		[0xfe00, 16, 'error'],
		[0xfeff, 16, 'error'],
		[0xff00, 16, 'notAvailable'],
		[0xffff, 16, 'notAvailable'],
		// 4-byte parameters: 0–0xFAFFFFFF valid, 0xFExxxxxx error, 0xFFxxxxxx n/a.
		[0xfaffffff, 32, 'valid'],
		[0xfb000000, 32, 'reserved'],
		[0xfe123456, 32, 'error'],
		[0xff000000, 32, 'notAvailable'],
		[0xffffffff, 32, 'notAvailable'],
		// 2-bit discrete: 00 off, 01 on, 10 error, 11 not available.
		[0, 2, 'valid'],
		[1, 2, 'valid'],
		[2, 2, 'error'],
		[3, 2, 'notAvailable'],
		// 4-bit discrete: 0–13 valid, 14 error, 15 not available.
		[13, 4, 'valid'],
		[14, 4, 'error'],
		[15, 4, 'notAvailable'],
		// No rule for other sizes.
		[0xffffff, 24, 'valid'],
		[7, 3, 'valid']
	] as const)('raw %d in %d bits → %s', (raw, length, status) => {
		expect(j1939ValueStatus(raw, length)).toBe(status);
	});

	it('reads a negative (two’s complement) raw value as its bit pattern', () => {
		// −1 in 8 bits is 0xFF, "not available"; −2 in 16 bits is 0xFFFE.
		expect(j1939ValueStatus(-1, 8)).toBe('notAvailable');
		expect(j1939ValueStatus(-2, 16)).toBe('notAvailable');
		expect(j1939ValueStatus(-0x1000000, 32)).toBe('notAvailable');
	});

	it('rejects a non-integer raw value', () => {
		expect(() => j1939ValueStatus(1.5, 8)).toThrow(RangeError);
	});
});

describe('SAE J1939-71 scaling through the codec and the compiled decoder', () => {
	// Each parameter sits where SAE J1939-71 puts it (byte numbers there count from 1; startBit here is
	// the LSB's payload bit, docs/bit-numbering.md), with the standard's resolution and offset. Positions,
	// resolutions and offsets are recalled from memory; the payload bytes are written by hand (least
	// significant byte first, as J1939 sends multi-byte parameters) and the expected physical values are
	// the hand-worked literals in the comments, so nothing below repeats the library's arithmetic.
	// Unused bytes are 0xFF ("not available"), as a J1939 sender fills them.
	const cases = [
		{
			// SPN 190 engine speed, EEC1 (PGN 61444) bytes 4–5, 0.125 rpm/bit: 0x1F40 = 8000 → 1000 rpm.
			what: 'engine speed',
			id: 0x0cf00400,
			startBit: 24,
			length: 16,
			scale: 0.125,
			offset: 0,
			payload: [0xff, 0xff, 0xff, 0x40, 0x1f, 0xff, 0xff, 0xff],
			expected: 1000
		},
		{
			// SPN 190 at the top of its operational range: 0xFAFF = 64255 × 0.125 = 8031.875 rpm, the
			// range end SAE J1939-71 lists for engine speed (from memory).
			what: 'engine speed, top of range',
			id: 0x0cf00400,
			startBit: 24,
			length: 16,
			scale: 0.125,
			offset: 0,
			payload: [0xff, 0xff, 0xff, 0xff, 0xfa, 0xff, 0xff, 0xff],
			expected: 8031.875
		},
		{
			// SPN 513 actual engine percent torque, EEC1 byte 3, 1 %/bit, −125 % offset: 125 → 0 %.
			what: 'percent torque at zero',
			id: 0x0cf00400,
			startBit: 16,
			length: 8,
			scale: 1,
			offset: -125,
			payload: [0xff, 0xff, 0x7d, 0xff, 0xff, 0xff, 0xff, 0xff],
			expected: 0
		},
		{
			// Same parameter at its top: 250 − 125 = 125 %.
			what: 'percent torque at its top',
			id: 0x0cf00400,
			startBit: 16,
			length: 8,
			scale: 1,
			offset: -125,
			payload: [0xff, 0xff, 0xfa, 0xff, 0xff, 0xff, 0xff, 0xff],
			expected: 125
		},
		{
			// SPN 110 engine coolant temperature, ET1 (PGN 65262) byte 1, 1 °C/bit, −40 °C: 130 → 90 °C.
			what: 'coolant temperature',
			id: 0x18feee00,
			startBit: 0,
			length: 8,
			scale: 1,
			offset: -40,
			payload: [0x82, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff],
			expected: 90
		},
		{
			// SPN 84 wheel-based vehicle speed, CCVS1 (PGN 65265) bytes 2–3, 1/256 km/h per bit:
			// 0x6400 = 25600 / 256 = 100 km/h.
			what: 'wheel-based speed',
			id: 0x18fef100,
			startBit: 8,
			length: 16,
			scale: 1 / 256,
			offset: 0,
			payload: [0xff, 0x00, 0x64, 0xff, 0xff, 0xff, 0xff, 0xff],
			expected: 100
		},
		{
			// SPN 91 accelerator pedal position 1, EEC2 (PGN 61443) byte 2, 0.4 %/bit: 250 → 100 %.
			what: 'accelerator pedal',
			id: 0x0cf00300,
			startBit: 8,
			length: 8,
			scale: 0.4,
			offset: 0,
			payload: [0xff, 0xfa, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff],
			expected: 100
		}
	];

	it.each(cases)(
		'$what: payload $payload → $expected',
		({ id, startBit, length, scale, offset, payload, expected }) => {
			const signal = { name: 'p', startBit, length, scale, offset };
			const map = canMapSchema.parse({
				format: 'framewright-map@1',
				name: 'J1939-71 parameters',
				frames: [{ name: 'F', id, extended: true, j1939: true, signals: [signal] }]
			});
			const data = Uint8Array.from(payload);
			expect(decodeSignal(map.frames[0].signals[0], data).value).toBeCloseTo(expected, 9);
			// The compiled decoder, matching a received ID from another source address (J1939-21: by PGN).
			const compiled = compileMap(map);
			const frame = compiled.lookup(id | 0x17, true)!;
			const out = new Float64Array(1);
			const status = new Uint8Array(1);
			frame.decode(data, 0, 8, out, 0, status);
			expect(out[0]).toBeCloseTo(expected, 9);
			expect(status[0]).toBe(SIGNAL_STATUS.valid);
			// Encoding is the inverse: the physical value writes the hand-written bytes back.
			const written = new Uint8Array(8).fill(0xff);
			encodeSignal(map.frames[0].signals[0], expected, written);
			expect(Array.from(written)).toEqual(payload);
		}
	);

	it('engine speed one step past the operational range is no longer a valid reading (J1939-71, from memory)', () => {
		// 0xFB00 starts the parameter-specific band and 0xFF00 "not available" for 2-byte parameters.
		expect(j1939ValueStatus(0xfb00, 16)).not.toBe('valid');
		expect(j1939ValueStatus(0xff00, 16)).toBe('notAvailable');
	});
});

const lampsOff = { state: 'off', flash: 'none' } as const;

describe('DM1 (SAE J1939-73)', () => {
	it('decodes a single-frame DM1 with one DTC, lamps and padding', () => {
		// Built from the J1939-73 layout: amber warning on (byte 0 bits 4–3 = 01 → 0x04), MIL off,
		// red stop off, protect off; flash bytes 0xFF (do not flash). SPN 100 (engine oil pressure),
		// FMI 1 (data valid but below normal operating range, most severe), OC 3, CM 0, then 0xFF pad.
		const frame = Uint8Array.of(0x04, 0xff, 0x64, 0x00, 0x01, 0x03, 0xff, 0xff);
		const dm1 = parseDm1(frame);
		expect(dm1.lamps.amberWarning).toEqual({ state: 'on', flash: 'none' });
		expect(dm1.lamps.malfunctionIndicator.state).toBe('off');
		expect(dm1.lamps.redStop.state).toBe('off');
		expect(dm1.lamps.protect.state).toBe('off');
		expect(dm1.troubleCodes).toEqual([
			{ spn: 100, fmi: 1, occurrenceCount: 3, conversionMethod: 0 }
		]);
	});

	it('decodes two trouble codes, including the 3 high SPN bits in byte 5 bits 8–6', () => {
		// SPN 110 (coolant temperature) FMI 0 OC 1; SPN 520192 = 0x7F000 (first proprietary SPN,
		// J1939-71, from memory) FMI 31 OC 127 (127 = occurrence count not available, from memory).
		// Lamps: MIL on (bits 8–7 = 01 → 0x40), red stop on (bits 6–5 = 01 → 0x10); MIL fast flash.
		const payload = Uint8Array.of(
			0x50,
			0x7f, // lamp status, flash (MIL 01 = fast, others 11 = none)
			0x6e,
			0x00,
			0x00,
			0x01, // SPN 110, FMI 0, CM 0, OC 1
			0x00,
			0xf0,
			0xff,
			0x7f // SPN 0x7F000: low 0x00, mid 0xF0, top 3 bits 111 | FMI 11111
		);
		const dm1 = parseDm1(payload);
		expect(dm1.lamps.malfunctionIndicator).toEqual({ state: 'on', flash: 'fast' });
		expect(dm1.lamps.redStop).toEqual({ state: 'on', flash: 'none' });
		expect(dm1.lamps.amberWarning.state).toBe('off');
		expect(dm1.troubleCodes).toEqual([
			{ spn: 110, fmi: 0, occurrenceCount: 1, conversionMethod: 0 },
			{ spn: 0x7f000, fmi: 31, occurrenceCount: 127, conversionMethod: 0 }
		]);
		expect(encodeDm1(dm1.lamps, dm1.troubleCodes)).toEqual(payload);
	});

	it('a DM1 without active faults (all-zero DTC slot) has no trouble codes', () => {
		// J1939-73 (from memory): with no active DTC, SPN = 0, FMI = 0, OC = 0 is sent.
		const dm1 = parseDm1(Uint8Array.of(0x00, 0xff, 0, 0, 0, 0, 0xff, 0xff));
		expect(dm1.troubleCodes).toEqual([]);
		const allOff = {
			malfunctionIndicator: lampsOff,
			redStop: lampsOff,
			amberWarning: lampsOff,
			protect: lampsOff
		};
		expect(parseDm1(encodeDm1(allOff, []))).toEqual(dm1);
	});

	it('rejects a payload shorter than the lamp bytes', () => {
		expect(() => parseDm1(Uint8Array.of(0x00))).toThrow(/lamp bytes/);
	});
});
