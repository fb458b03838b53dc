import { describe, expect, it } from 'vitest';
import { fieldFits, fieldLayout } from './bits';
import { decodeFrame } from './codec';
import { compileMap, SIGNAL_STATUS, type CompileOptions } from './decoder';
import { canMapSchema, type CanMapInput, type SignalInput } from './map';
import { referenceExtract } from './testing/reference-bits';
import { seededRandom } from './testing/seeded-random';

const mapOf = (frames: CanMapInput['frames']) =>
	canMapSchema.parse({ format: 'framewright-map@1', name: 'test', frames });

/** Decode one frame of a compiled map into fresh arrays. */
function run(
	options: CompileOptions,
	map: ReturnType<typeof mapOf>,
	frameIndex: number,
	bytes: number[] | Uint8Array,
	offset = 0,
	length = bytes.length - offset
) {
	const compiled = compileMap(map, options).frames[frameIndex];
	const out = new Float64Array(compiled.channelCount);
	const status = new Uint8Array(compiled.channelCount);
	compiled.decode(Uint8Array.from(bytes), offset, length, out, 0, status);
	return { values: Array.from(out), status: Array.from(status) };
}

// Both decoders — generated code and the portable loop (used where code generation is forbidden) — must agree.
describe.each([{ codegen: true }, { codegen: false }])('compileMap %o', (options) => {
	describe('compiled decode of byte-aligned fields equals DataView', () => {
		// General-purpose reference: DataView getUint8/16/32, getInt8/16/32, getBigUint64/getBigInt64 (then Number),
		// getFloat32/64 — littleEndian true/false (ECMAScript spec, IEEE 754).
		it('for every size, type and order at random offsets inside a larger buffer', () => {
			const rand = seededRandom(0x5eed11);
			type Kind = {
				bytes: number;
				valueType: SignalInput['valueType'];
				read: (v: DataView, at: number, le: boolean) => number;
			};
			const kinds: Kind[] = [
				{ bytes: 1, valueType: 'unsigned', read: (v, at) => v.getUint8(at) },
				{ bytes: 1, valueType: 'signed', read: (v, at) => v.getInt8(at) },
				{ bytes: 2, valueType: 'unsigned', read: (v, at, le) => v.getUint16(at, le) },
				{ bytes: 2, valueType: 'signed', read: (v, at, le) => v.getInt16(at, le) },
				{ bytes: 4, valueType: 'unsigned', read: (v, at, le) => v.getUint32(at, le) },
				{ bytes: 4, valueType: 'signed', read: (v, at, le) => v.getInt32(at, le) },
				{ bytes: 4, valueType: 'float32', read: (v, at, le) => v.getFloat32(at, le) },
				{ bytes: 8, valueType: 'unsigned', read: (v, at, le) => Number(v.getBigUint64(at, le)) },
				{ bytes: 8, valueType: 'signed', read: (v, at, le) => Number(v.getBigInt64(at, le)) },
				{ bytes: 8, valueType: 'float64', read: (v, at, le) => v.getFloat64(at, le) }
			];
			for (const kind of kinds) {
				for (const byteOrder of ['little', 'big'] as const) {
					const k = rand.int(0, 64 - kind.bytes);
					// docs/bit-numbering.md: big-endian field filling bytes k…k+m−1 has startBit 8·(k+m−1)
					const startBit = byteOrder === 'little' ? 8 * k : 8 * (k + kind.bytes - 1);
					const map = mapOf([
						{
							name: 'F',
							id: 1,
							length: 64,
							signals: [
								{
									name: 's',
									startBit,
									length: kind.bytes * 8,
									byteOrder,
									valueType: kind.valueType
								}
							]
						}
					]);
					const frame = compileMap(map, options).frames[0];
					const buffer = rand.bytes(64 * 50);
					const view = new DataView(buffer.buffer);
					const out = new Float64Array(1);
					for (let f = 0; f < 50; f++) {
						frame.decode(buffer, f * 64, 64, out, 0);
						expect(out[0]).toBe(kind.read(view, f * 64 + k, byteOrder === 'little'));
					}
				}
			}
		});
	});

	describe('compiled decode of unaligned fields equals the slow reference', () => {
		it('random integer fields, 1–64 bits, both orders, signed and unsigned, with scale and offset', () => {
			const rand = seededRandom(0x5eed12);
			for (let round = 0; round < 300; round++) {
				const signals: SignalInput[] = [];
				for (let i = 0; i < 6; i++) {
					const length = rand.int(1, 64);
					const byteOrder = rand.pick(['little', 'big'] as const);
					let startBit = rand.int(0, 511);
					while (!fieldFits(fieldLayout(startBit, length, byteOrder), 64))
						startBit = rand.int(0, 511);
					signals.push({
						name: `s${i}`,
						startBit,
						length,
						byteOrder,
						valueType: rand.pick(['unsigned', 'signed'] as const),
						scale: rand.pick([1, 0.1, 4]),
						offset: rand.int(-50, 50)
					});
				}
				const map = mapOf([{ name: 'F', id: 0x123, length: 64, signals }]);
				const data = rand.bytes(64);
				const { values } = run(options, map, 0, data);
				signals.forEach((s, i) => {
					const unsigned = referenceExtract(data, s.startBit, s.length, s.byteOrder!);
					const raw = s.valueType === 'signed' ? BigInt.asIntN(s.length, unsigned) : unsigned;
					expect(values[i]).toBe(Number(raw) * s.scale! + s.offset!);
				});
			}
		});
	});

	it('unaligned float32/float64 fields read as IEEE 754 of the reference bits (DataView as reference)', () => {
		const rand = seededRandom(0x5eed13);
		const scratch = new DataView(new ArrayBuffer(8));
		for (let round = 0; round < 300; round++) {
			const length = rand.pick([32, 64]);
			const byteOrder = rand.pick(['little', 'big'] as const);
			let startBit = rand.int(0, 511);
			while (!fieldFits(fieldLayout(startBit, length, byteOrder), 64)) startBit = rand.int(0, 511);
			const map = mapOf([
				{
					name: 'F',
					id: 1,
					length: 64,
					signals: [
						{
							name: 'f',
							startBit,
							length,
							byteOrder,
							valueType: length === 32 ? 'float32' : 'float64'
						}
					]
				}
			]);
			const data = rand.bytes(64);
			const bits = referenceExtract(data, startBit, length, byteOrder);
			let expected: number;
			if (length === 32) {
				scratch.setUint32(0, Number(bits));
				expected = scratch.getFloat32(0);
			} else {
				scratch.setBigUint64(0, bits);
				expected = scratch.getFloat64(0);
			}
			expect(run(options, map, 0, data).values[0]).toBe(expected);
		}
	});

	it('agrees with codec.decodeFrame (BigInt path) on random multiplexed frames and short payloads', () => {
		const rand = seededRandom(0x5eed14);
		for (let round = 0; round < 200; round++) {
			const signals: SignalInput[] = [
				{ name: 'mux', startBit: rand.int(0, 6) * 8, length: 2, multiplexer: true }
			];
			for (let i = 0; i < 5; i++) {
				const length = rand.int(1, 64);
				const byteOrder = rand.pick(['little', 'big'] as const);
				let startBit = rand.int(0, 63);
				while (!fieldFits(fieldLayout(startBit, length, byteOrder), 8)) startBit = rand.int(0, 63);
				signals.push({
					name: `s${i}`,
					startBit,
					length,
					byteOrder,
					valueType: rand.pick(['unsigned', 'signed'] as const),
					muxValue: rand.pick([null, 0, 1, 2, 3]),
					offset: rand.int(-9, 9)
				});
			}
			const map = mapOf([{ name: 'F', id: 1, signals }]);
			const received = rand.int(0, 8);
			const data = rand.bytes(received);
			const expected = decodeFrame(map.frames[0], data).map((r) =>
				r.present ? r.value : Number.NaN
			);
			expect(run(options, map, 0, data).values).toEqual(expected);
		}
	});

	it('decodeAt over a large map agrees with codec.decodeFrame (BigInt path) for every frame kind', () => {
		// 160 frames × 3–4 signals: past the dispatcher's inline budget, so both inlined cases and
		// direct calls are exercised; every fourth frame repeats the layout of the one before (shared case).
		const rand = seededRandom(0x5eed15);
		const frames: CanMapInput['frames'] = [];
		for (let f = 0; f < 160; f++) {
			if (f % 4 === 3) {
				frames.push({ ...frames[f - 1], name: `F${f}`, id: f + 1 });
				continue;
			}
			const signals: SignalInput[] = [{ name: 'mux', startBit: 0, length: 2, multiplexer: true }];
			for (let i = 0; i < rand.int(2, 3); i++) {
				const length = rand.int(1, 64);
				const byteOrder = rand.pick(['little', 'big'] as const);
				let startBit = rand.int(0, 63);
				while (!fieldFits(fieldLayout(startBit, length, byteOrder), 8)) startBit = rand.int(0, 63);
				signals.push({
					name: `s${i}`,
					startBit,
					length,
					byteOrder,
					valueType: rand.pick(['unsigned', 'signed'] as const),
					muxValue: rand.pick([null, 1, 2]),
					scale: rand.pick([1, 0.5, 0.1])
				});
			}
			frames.push({ name: `F${f}`, id: f + 1, signals });
		}
		const map = mapOf(frames);
		const compiled = compileMap(map, options);
		const out = new Float64Array(compiled.channels.length);
		for (let round = 0; round < 2000; round++) {
			const f = rand.int(0, frames.length - 1);
			const data = rand.bytes(rand.int(0, 8));
			out.fill(-1);
			compiled.decodeAt(f, data, 0, data.length, out, compiled.frames[f].channelStart);
			const { channelStart, channelCount } = compiled.frames[f];
			const expected = decodeFrame(map.frames[f], data).map((r) =>
				r.present ? r.value : Number.NaN
			);
			expect(Array.from(out.subarray(channelStart, channelStart + channelCount))).toEqual(expected);
			// Column-major output: signal k at 1 + k·3 (stride 3), through the dispatcher and the frame itself.
			for (const decode of [compiled.decodeAt.bind(null, f), compiled.frames[f].decode]) {
				const strided = new Float64Array(3 * channelCount + 1).fill(-1);
				decode(data, 0, data.length, strided, 1, undefined, 3);
				expect(Array.from({ length: channelCount }, (_, k) => strided[1 + 3 * k])).toEqual(
					expected
				);
			}
		}
	});

	it('indexOf finds standard IDs through the dense table and everything else by key', () => {
		const map = mapOf([
			{ name: 'Zero', id: 0, signals: [] },
			{ name: 'Top', id: '0x7FF', signals: [] },
			{ name: 'TopAgain', id: '0x7FF', signals: [] }, // duplicate: the first definition wins
			{ name: 'Wide', id: '0x800', signals: [] }, // a standard frame above 11 bits (a lint error) still decodes
			{ name: 'Ext', id: '0x7FF', extended: true, signals: [] }
		]);
		const compiled = compileMap(map, options);
		expect(
			[0, 0x7ff, 0x800, 0x123, -1, 1.5, 0x2000].map((id) => compiled.indexOf(id, false))
		).toEqual([0, 1, 3, -1, -1, -1, -1]);
		// Alternating extended IDs exercise the remembered last answer.
		expect([0x7ff, 0x7fe, 0x7ff, 0x7ff, 0].map((id) => compiled.indexOf(id, true))).toEqual([
			4, -1, 4, 4, -1
		]);
		expect(compiled.lookup(0x7ff, false)?.frame.name).toBe('Top');
		expect(compiled.lookup(0x123, false)).toBeUndefined();
	});

	it(options.codegen ? 'uses generated code' : 'uses the portable loop', () => {
		const frame = compileMap(mapOf([{ name: 'F', id: 1, signals: [] }]), options).frames[0];
		expect(frame.decode.name === 'decode').toBe(options.codegen);
	});

	describe('presence and multiplexing', () => {
		const map = mapOf([
			{
				name: 'Pages',
				id: '0x500',
				signals: [
					{ name: 'page', startBit: 0, length: 4, multiplexer: true },
					{ name: 'a', startBit: 8, length: 8, muxValue: 0 },
					{ name: 'b', startBit: 8, length: 8, muxValue: 1, scale: 2 },
					{ name: 'tail', startBit: 56, length: 8 }
				]
			}
		]);

		it('decodes only the selected page', () => {
			expect(run(options, map, 0, [0x01, 10, 0, 0, 0, 0, 0, 3])).toEqual({
				values: [1, Number.NaN, 20, 3],
				status: [0, 1, 0, 0]
			});
			expect(run(options, map, 0, [0xf0, 10, 0, 0, 0, 0, 0, 3])).toEqual({
				values: [0, 10, Number.NaN, 3],
				status: [0, 0, 1, 0]
			});
		});

		it('hides multiplexed signals of a frame without multiplexer', () => {
			const orphan = mapOf([
				{ name: 'O', id: 7, signals: [{ name: 'x', startBit: 0, length: 8, muxValue: 0 }] }
			]);
			expect(run(options, orphan, 0, [0, 0, 0, 0, 0, 0, 0, 0])).toEqual({
				values: [Number.NaN],
				status: [1]
			});
		});

		it('marks signals past the received length absent', () => {
			expect(run(options, map, 0, [0, 10, 0, 0])).toEqual({
				values: [0, 10, Number.NaN, Number.NaN],
				status: [0, 0, 1, 1]
			});
		});

		it('honours offset and length inside a shared buffer', () => {
			expect(run(options, map, 0, [9, 9, 0x01, 10, 0, 0, 0, 0, 0, 3], 2, 8).values).toEqual([
				1,
				Number.NaN,
				20,
				3
			]);
		});
	});

	describe('J1939', () => {
		const map = mapOf([
			{
				// PGN 65265 (0xFEF1, PDU2) — real PGN number reused for an invented frame; layout here is demo only
				name: 'VehicleSpeedDemo',
				id: '0x18FEF100',
				extended: true,
				j1939: true,
				signals: [{ name: 'x', startBit: 0, length: 8 }]
			},
			{
				// PGN 61444 EEC1 (J1939-71, from memory): engine speed SPN 190 in bytes 4–5, 0.125 rpm/bit
				name: 'EngineDemo',
				id: '0x0CF00400',
				extended: true,
				j1939: true,
				signals: [
					{ name: 'engineSpeed', startBit: 24, length: 16, scale: 0.125, unit: 'rpm' },
					{ name: 'torqueMode', startBit: 0, length: 4 },
					{ name: 'signedThing', startBit: 8, length: 8, valueType: 'signed' }
				]
			},
			{ name: 'Plain', id: '0x0CF00400', extended: false, signals: [] }
		]);
		const compiled = compileMap(map, options);

		it('matches received IDs by PGN whatever the priority and source address (SAE J1939-21 ID layout)', () => {
			// 0x18FEF100 = priority 6, PGN 0xFEF1, SA 0x00; 0x0CFEF117 = priority 3, same PGN, SA 0x17
			expect(compiled.lookup(0x0cfef117, true)?.frameIndex).toBe(0);
			expect(compiled.lookup(0x1cfef1fe, true)?.frameIndex).toBe(0);
			expect(compiled.lookup(0x18f00403, true)?.frameIndex).toBe(1);
			expect(compiled.lookup(0x18fef200, true)).toBeUndefined(); // another PGN
			expect(compiled.lookup(0x1cfef117, false)).toBeUndefined(); // standard frames never match by PGN
			expect(
				[0x0cfef117, 0x18f00403, 0x0cfef117, 0x18fef200].map((id) => compiled.indexOf(id, true))
			).toEqual([0, 1, 0, -1]);
		});

		it('keeps standard and extended IDs apart', () => {
			expect(compiled.lookup(0x0cf00400, false)?.frameIndex).toBe(2);
			expect(compiled.lookup(0x0cf00400, true)?.frameIndex).toBe(1);
		});

		it('turns J1939-71 "not available" and "error" raw values into NaN with a status (from memory)', () => {
			// J1939-71: 2-byte parameter 0xFF00–0xFFFF not available, 0xFE00–0xFEFF error;
			// 4-bit discrete 0xF not available, 0xE error. Signed signals are not checked.
			const decodeBytes = (bytes: number[]) => {
				const out = new Float64Array(3);
				const status = new Uint8Array(3);
				compiled.frames[1].decode(Uint8Array.from(bytes), 0, 8, out, 0, status);
				return { values: Array.from(out), status: Array.from(status) };
			};
			expect(decodeBytes([0x03, 0xff, 0, 0x40, 0x1f, 0, 0, 0])).toEqual({
				values: [1000, 3, -1],
				status: [0, 0, 0]
			});
			expect(decodeBytes([0x0f, 0xff, 0, 0xff, 0xff, 0, 0, 0])).toEqual({
				values: [Number.NaN, Number.NaN, -1],
				status: [SIGNAL_STATUS.notAvailable, SIGNAL_STATUS.notAvailable, SIGNAL_STATUS.valid]
			});
			expect(decodeBytes([0x0e, 0, 0, 0x12, 0xfe, 0, 0, 0]).status).toEqual([
				SIGNAL_STATUS.error,
				SIGNAL_STATUS.error,
				0
			]);
		});
	});

	describe('channels', () => {
		it('lists one channel per signal in map order with frame offsets', () => {
			const compiled = compileMap(
				mapOf([
					{
						name: 'A',
						id: 1,
						signals: [
							{ name: 'a1', startBit: 0, length: 8, unit: 'V', min: 0, max: 16 },
							{ name: 'a2', startBit: 8, length: 8 }
						]
					},
					{ name: 'B', id: 2, signals: [{ name: 'b1', startBit: 0, length: 8 }] }
				]),
				options
			);
			expect(compiled.channels.map((c) => `${c.index}:${c.frameName}.${c.signalName}`)).toEqual([
				'0:A.a1',
				'1:A.a2',
				'2:B.b1'
			]);
			expect(compiled.channels[0]).toMatchObject({ unit: 'V', min: 0, max: 16, frameIndex: 0 });
			expect(compiled.frames.map((f) => [f.channelStart, f.channelCount])).toEqual([
				[0, 2],
				[2, 1]
			]);
		});
	});
});
