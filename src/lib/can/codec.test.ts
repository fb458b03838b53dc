import { describe, expect, it } from 'vitest';
import { extractRaw, fieldFits, fieldLayout } from './bits';
import { decodeFrame, decodeSignal, encodeSignal, rawBounds } from './codec';
import { frameSchema, signalSchema, type SignalInput } from './map';
import { seededRandom } from './testing/seeded-random';

const signal = (input: Partial<SignalInput>) =>
	signalSchema.parse({ name: 's', startBit: 0, length: 8, ...input });

describe('decodeSignal', () => {
	it('scales engine speed like SAE J1939-71 SPN 190 (0.125 rpm/bit, bytes 4–5 little-endian) (from memory)', () => {
		const speed = signal({ startBit: 24, length: 16, scale: 0.125, unit: 'rpm' });
		// raw 0x1F40 = 8000 → 1000 rpm
		const data = Uint8Array.from([0xff, 0xff, 0xff, 0x40, 0x1f, 0xff, 0xff, 0xff]);
		expect(decodeSignal(speed, data)).toEqual({
			raw: 8000,
			value: 1000,
			label: null,
			inRange: true
		});
	});

	it('applies the offset like SAE J1939-71 SPN 110 coolant temperature (1 °C/bit, −40 °C) (from memory)', () => {
		const coolant = signal({ startBit: 0, length: 8, offset: -40, unit: '°C' });
		expect(decodeSignal(coolant, Uint8Array.from([90])).value).toBe(50); // raw 90 → 50 °C
	});

	it('reads two’s complement signed fields (DataView getInt16 as reference)', () => {
		const data = Uint8Array.from([0x18, 0xfc]); // −1000 little-endian
		const s = signal({ length: 16, valueType: 'signed', scale: 0.01 });
		expect(decodeSignal(s, data).raw).toBe(new DataView(data.buffer).getInt16(0, true));
		expect(decodeSignal(s, data).value).toBeCloseTo(-10, 12);
	});

	it('reads float32 fields as IEEE 754 (DataView getFloat32 as reference)', () => {
		const data = new Uint8Array(8);
		new DataView(data.buffer).setFloat32(2, -12.625, false); // big-endian at bytes 2…5
		const s = signal({ startBit: 40, length: 32, byteOrder: 'big', valueType: 'float32' });
		expect(decodeSignal(s, data).value).toBe(-12.625);
	});

	it('returns raw as bigint above 53 bits, exactly', () => {
		const data = new Uint8Array(8).fill(0xff);
		expect(decodeSignal(signal({ length: 64 }), data).raw).toBe(2n ** 64n - 1n);
		expect(decodeSignal(signal({ length: 64, valueType: 'signed' }), data).raw).toBe(-1n);
	});

	it('looks up labels by raw value and checks min/max', () => {
		const gear = signal({ length: 4, labels: { '0': 'neutral', '15': 'fault' }, min: 0, max: 8 });
		expect(decodeSignal(gear, Uint8Array.from([0x00]))).toMatchObject({
			label: 'neutral',
			inRange: true
		});
		expect(decodeSignal(gear, Uint8Array.from([0x0f]))).toMatchObject({
			label: 'fault',
			inRange: false
		});
		expect(decodeSignal(gear, Uint8Array.from([0x03]))).toMatchObject({ label: null, value: 3 });
	});

	it('rejects a float signal whose length is not 32/64, and fields past the payload', () => {
		expect(() =>
			decodeSignal(signal({ length: 16, valueType: 'float32' }), new Uint8Array(8))
		).toThrow(/float32 but 16 bits/);
		expect(() => decodeSignal(signal({ startBit: 60, length: 8 }), new Uint8Array(8))).toThrow(
			/payload has 8/
		);
	});
});

describe('encodeSignal', () => {
	it('rounds to the nearest raw and writes only the field', () => {
		const data = new Uint8Array(8).fill(0xaa);
		const s = signal({ startBit: 8, length: 16, byteOrder: 'big', scale: 0.1 });
		// big-endian field in bytes 0…1 (startBit 8); 12.34 / 0.1 = 123.4 → 123 = 0x007B
		expect(encodeSignal(s, 12.34, data)).toEqual({ raw: 123n, clamped: false, outOfRange: false });
		expect(Array.from(data.subarray(0, 3))).toEqual([0x00, 0x7b, 0xaa]);
	});

	it('clamps to the raw range and flags out-of-range against min/max', () => {
		const s = signal({ length: 8, valueType: 'signed', min: -50, max: 50 });
		const data = new Uint8Array(1);
		expect(encodeSignal(s, 300, data)).toEqual({ raw: 127n, clamped: true, outOfRange: true });
		expect(encodeSignal(s, -300, data)).toEqual({ raw: -128n, clamped: true, outOfRange: true });
		expect(data[0]).toBe(0x80);
		expect(encodeSignal(s, 60, data)).toEqual({ raw: 60n, clamped: false, outOfRange: true });
	});

	it('reports a clamp when value / scale overflows to infinity (largest double over a tiny scale)', () => {
		// Number.MAX_VALUE / 1e-10 is +Infinity in IEEE 754 double arithmetic; the field's top is 255.
		const s = signal({ length: 8, scale: 1e-10 });
		const data = new Uint8Array(1);
		expect(Number.MAX_VALUE / 1e-10).toBe(Infinity);
		expect(encodeSignal(s, Number.MAX_VALUE, data)).toEqual({
			raw: 255n,
			clamped: true,
			outOfRange: false
		});
		expect(encodeSignal(s, -Number.MAX_VALUE, data)).toMatchObject({ raw: 0n, clamped: true });
	});

	it('writes float64 as IEEE 754 bits (DataView getFloat64 as reference)', () => {
		const data = new Uint8Array(8);
		encodeSignal(signal({ length: 64, valueType: 'float64' }), Math.PI, data);
		expect(new DataView(data.buffer).getFloat64(0, true)).toBe(Math.PI);
	});

	it('rejects scale 0 and non-finite input with a clear message', () => {
		expect(() => encodeSignal(signal({ scale: 0 }), 1, new Uint8Array(8))).toThrow(/scale 0/);
		expect(() => encodeSignal(signal({}), Number.NaN, new Uint8Array(8))).toThrow(
			/cannot encode NaN/
		);
	});

	it('round-trips random definitions: decode(encode(x)) is the nearest representable value', () => {
		const rand = seededRandom(0x5eed03);
		for (let round = 0; round < 2000; round++) {
			const valueType = rand.pick(['unsigned', 'signed'] as const);
			// up to 50 bits: larger physical values cannot round-trip exactly through a double
			const length = rand.int(1, 50);
			const byteOrder = rand.pick(['little', 'big'] as const);
			let startBit = rand.int(0, 511);
			while (!fieldFits(fieldLayout(startBit, length, byteOrder), 64)) startBit = rand.int(0, 511);
			const s = signal({
				startBit,
				length,
				byteOrder,
				valueType,
				scale: rand.pick([1, 0.5, 0.125, 2]),
				offset: rand.int(-100, 100)
			});
			const { lo, hi } = rawBounds(s);
			// a random raw inside the field's range, then its physical value
			const span = hi - lo + 1n;
			const wanted = lo + (extractRaw(rand.bytes(8), 0, 64, 'little') % span);
			const physical = Number(wanted) * s.scale + s.offset;
			const data = rand.bytes(64);
			const before = data.slice();
			const encoded = encodeSignal(s, physical, data);
			expect(encoded).toEqual({ raw: wanted, clamped: false, outOfRange: false });
			const decoded = decodeSignal(s, data);
			expect(decoded.raw).toBe(Number(wanted));
			expect(decoded.value).toBe(physical);
			// re-encoding the decoded value changes nothing
			encodeSignal(s, decoded.value, before);
			expect(before).toEqual(data);
		}
	});
});

describe('decodeFrame multiplexing', () => {
	const frame = frameSchema.parse({
		name: 'Status',
		id: '0x400',
		signals: [
			{ name: 'page', startBit: 0, length: 8, multiplexer: true },
			{ name: 'oilPressure', startBit: 8, length: 8, muxValue: 0 },
			{ name: 'fuelPressure', startBit: 8, length: 8, muxValue: 1 },
			{ name: 'counter', startBit: 56, length: 8 }
		]
	});

	it('shows only the signals of the selected page plus the always-present ones', () => {
		const result = decodeFrame(frame, Uint8Array.from([1, 42, 0, 0, 0, 0, 0, 7]));
		expect(result.map((r) => (r.present ? r.value : null))).toEqual([1, null, 42, 7]);
	});

	it('marks signals beyond a short payload as absent', () => {
		const result = decodeFrame(frame, Uint8Array.from([0, 5]));
		expect(result.map((r) => r.present)).toEqual([true, true, false, false]);
	});
});
