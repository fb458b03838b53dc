import { describe, expect, it } from 'vitest';
import { canMapSchema, type CanMapInput } from '../map';
import { SPECIAL_FRAMES } from '../testing/codegen-harness';
import { CODEGEN_VERSION, generateC } from './generate';

const mapOf = (frames: CanMapInput['frames'], name = 'Bench map') =>
	canMapSchema.parse({ format: 'framewright-map@1', name, frames });
const options = { prefix: 'fw', mapName: 'Bench map', generatorVersion: 'framewright test' };

describe('generateC names', () => {
	it('turns names into snake_case members and functions', () => {
		const result = generateC(
			mapOf([
				{
					name: 'EngineCore',
					id: '0x5F0',
					signals: [{ name: 'EngineSpeed', startBit: 0, length: 16 }]
				}
			]),
			options
		);
		expect(result.notes).toEqual([]);
		expect(result.frames[0]).toMatchObject({
			cName: 'engine_core',
			typeName: 'fw_engine_core_t',
			decode: 'fw_engine_core_decode',
			encode: 'fw_engine_core_encode',
			matches: null,
			page: null,
			signals: [
				{
					member: 'engine_speed',
					unpack: 'fw_engine_core_engine_speed_unpack',
					pack: 'fw_engine_core_engine_speed_pack'
				}
			]
		});
		expect(result.header).toContain('#define FW_ENGINE_CORE_ID 0x5F0u');
		expect(result.header).toContain('#define FW_ENGINE_CORE_LENGTH 8');
		expect(result.header).toContain('#define FW_ENGINE_CORE_EXTENDED 0');
		expect(result.header).toMatch(/double engine_speed;/);
		expect(result.header).toContain(
			'int fw_engine_core_decode(const uint8_t *data, uint8_t length, fw_engine_core_t *out);'
		);
		expect(result.header).toContain(
			'int fw_engine_core_encode(const fw_engine_core_t *in, uint8_t *data, uint8_t length);'
		);
	});

	it('disambiguates invalid and duplicate identifiers deterministically and says so', () => {
		const map = mapOf([
			{
				name: 'A',
				id: '0x100',
				signals: [
					{ name: 'int', startBit: 0, length: 1 },
					{ name: '2ndGear', startBit: 1, length: 1 },
					{ name: '°', startBit: 2, length: 1 },
					{ name: 'Speed', startBit: 3, length: 1 },
					{ name: 'speed', startBit: 4, length: 1 },
					{ name: 'speed_2', startBit: 5, length: 1 }, // keeps its name; the duplicate moves on to _3
					{ name: 'B_C', startBit: 6, length: 1 }
				]
			},
			// "A_B" + "C" would make fw_a_b_c_unpack, which frame A's "B_C" already has.
			{ name: 'A_B', id: '0x101', signals: [{ name: 'C', startBit: 0, length: 1 }] },
			{ name: 'a', id: '0x102' }, // same C name as frame "A"
			{
				name: 'Paged',
				id: '0x103',
				signals: [
					{ name: 'Mux', startBit: 0, length: 2, multiplexer: true },
					{ name: 'MuxPage', startBit: 2, length: 2 } // the decoded-page member is called mux_page
				]
			}
		]);
		const first = generateC(map, options);
		expect(generateC(map, options)).toEqual(first); // same input, same text and names
		const members = first.frames.map((f) => f.signals.map((s) => s.member));
		expect(members).toEqual([
			['s_int', 's_2nd_gear', 'signal_2', 'speed', 'speed_3', 'speed_2', 'b_c'],
			['c_2'],
			[],
			['mux', 'mux_page_2']
		]);
		expect(first.frames.map((f) => f.cName)).toEqual(['a', 'a_b', 'a_2', 'paged']);
		// in map order, whichever step found them
		expect(first.notes.map((n) => n.path)).toEqual([
			'frames[0].signals[0]',
			'frames[0].signals[1]',
			'frames[0].signals[2]',
			'frames[0].signals[4]',
			'frames[1].signals[0]',
			'frames[2]',
			'frames[3].signals[1]'
		]);
		const notes = Object.fromEntries(first.notes.map((n) => [n.path, n.message]));
		expect(notes).toEqual({
			'frames[0].signals[0]': expect.stringMatching(
				/"int" is named s_int: int is a C or C\+\+ keyword/
			),
			'frames[0].signals[1]': expect.stringMatching(
				/s_2nd_gear: a C name cannot start with a digit/
			),
			'frames[0].signals[2]': expect.stringMatching(/signal_2: its name has no letters or digits/),
			'frames[0].signals[4]': expect.stringMatching(
				/"speed" is named speed_3: speed is already used/
			),
			'frames[1].signals[0]': expect.stringMatching(/"C" is named c_2: c is already used/),
			'frames[2]': expect.stringMatching(/"a" is named a_2/),
			'frames[3].signals[1]': expect.stringMatching(/"MuxPage" is named mux_page_2/)
		});
	});
});

describe('generateC content', () => {
	it('leaves out what cannot be generated and says why', () => {
		const result = generateC(mapOf(SPECIAL_FRAMES), options);
		const troubled = result.frames.find((f) => f.name === 'Troubled')!;
		expect(troubled.signals.map((s) => s.name)).toEqual(['Fine', 'Frozen']);
		expect(troubled.signals.map((s) => s.encoded)).toEqual([true, false]);
		const messages = result.notes.map((n) => `${n.path} ${n.message}`);
		expect(messages).toEqual(
			expect.arrayContaining([
				expect.stringMatching(
					/^frames\[0\]\.signals\[6\] "P5Never" has mux value 5, which the multiplexer "Sel" can never carry/
				),
				expect.stringMatching(
					/^frames\[3\]\.signals\[1\] "TooFar" needs payload bytes 3…4 but the frame has 4/
				),
				// big-endian from bit 2: 8 bits climb to bit 7 of byte 0 and would continue in byte −1
				expect.stringMatching(/^frames\[3\]\.signals\[2\] "BigOffByteZero" runs past byte 0/),
				expect.stringMatching(
					/^frames\[3\]\.signals\[3\] "ShortFloat" is float32 but 16 bits long/
				),
				expect.stringMatching(
					/^frames\[3\]\.signals\[4\] "Orphan" has mux value 1 but the frame has no usable multiplexer/
				),
				expect.stringMatching(/^frames\[3\]\.signals\[5\] "Frozen" has scale 0/)
			])
		);
		expect(result.notes).toHaveLength(6);
		// C99 6.7.2.1 wants at least one member: frames without signals get a placeholder.
		expect(result.header).toMatch(/typedef struct \{\n\tchar no_signals;[^\n]*\n\} fw_empty_t;/);
	});

	it('picks the smallest exact-width type for raw values (C99 7.18.1.1)', () => {
		const signals = [
			{ name: 'u1', startBit: 0, length: 1 },
			{ name: 'u8', startBit: 8, length: 8 },
			{ name: 'u9', startBit: 16, length: 9 },
			{ name: 's12', startBit: 32, length: 12, valueType: 'signed' as const },
			{ name: 'u17', startBit: 64, length: 17 },
			{ name: 's33', startBit: 96, length: 33, valueType: 'signed' as const },
			{ name: 'f32', startBit: 160, length: 32, valueType: 'float32' as const },
			{ name: 'f64', startBit: 192, length: 64, valueType: 'float64' as const }
		];
		const result = generateC(mapOf([{ name: 'T', id: '0x1', length: 32, signals }]), options);
		expect(result.frames[0].signals.map((s) => s.rawType)).toEqual([
			'uint8_t',
			'uint8_t',
			'uint16_t',
			'int16_t',
			'uint32_t',
			'int64_t',
			'uint32_t', // floats travel as their IEEE 754 bit pattern
			'uint64_t'
		]);
	});

	it('gives J1939 frames a PGN and a match helper (SAE J1939-21: 0x18FEF100 carries PGN 0xFEF1) (from memory)', () => {
		const result = generateC(
			mapOf([
				{ name: 'Cruise', id: '0x18FEF100', extended: true, j1939: true },
				{ name: 'NotReally', id: '0x123', j1939: true }
			]),
			options
		);
		expect(result.frames.map((f) => f.matches)).toEqual(['fw_cruise_matches', null]);
		expect(result.header).toContain('#define FW_CRUISE_PGN 0xFEF1u');
		expect(result.header).toContain('#define FW_CRUISE_EXTENDED 1');
		expect(result.header).toContain('uint32_t fw_j1939_pgn(uint32_t id);');
		expect(result.notes).toEqual([
			{ path: 'frames[1]', message: expect.stringMatching(/J1939 but has an 11-bit ID/) }
		]);
	});

	it('names map, revision and generator in a header comment that no name can break', () => {
		const result = generateC(mapOf([]), {
			prefix: 'ecu',
			mapName: 'Rig */ #error ??/',
			revision: 'r7',
			generatorVersion: `framewright ${CODEGEN_VERSION}`
		});
		for (const text of [result.header, result.source]) {
			expect(text).toContain(' * Map:       Rig * / #error ? ?/');
			expect(text).toContain(' * Revision:  r7');
			expect(text).toContain(` * Generator: framewright ${CODEGEN_VERSION}`);
		}
		expect(result.header).toMatch(/#ifndef ECU_H\n#define ECU_H/);
		expect(result.source).toContain('#include "ecu.h"');
		expect(generateC(mapOf([]), options).header).toContain(
			' * Revision:  none (generated from a map file)'
		);
	});

	it('refuses a prefix that is no C identifier', () => {
		expect(() => generateC(mapOf([]), { ...options, prefix: 'My-ECU' })).toThrow(
			/prefix must start with a lower-case letter/
		);
	});
});
