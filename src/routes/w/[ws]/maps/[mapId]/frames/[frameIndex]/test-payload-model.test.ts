import { describe, expect, it } from 'vitest';
import { frameSchema } from '$lib/can/map';
import { decodeRows, encodeInto, formatPhysical } from './test-payload-model';

// Two SAE J1939-71 parameters laid out as in EEC1 / ET1 (from memory): engine speed 0.125 rpm/bit,
// 16 bits little-endian from byte 3; coolant temperature 1 °C/bit, offset −40 °C, byte 0.
const frame = frameSchema.parse({
	name: 'Demo',
	id: '0x100',
	length: 8,
	signals: [
		{ name: 'EngineSpeed', startBit: 24, length: 16, scale: 0.125, unit: 'rpm', max: 8031.875 },
		{
			name: 'Coolant',
			startBit: 0,
			length: 8,
			offset: -40,
			unit: '°C',
			labels: { '255': 'Not available' }
		},
		{ name: 'Beyond', startBit: 64, length: 8 }
	]
});

describe('decodeRows', () => {
	it('decodes raw and physical values (SAE J1939-71: 0x2EE0 × 0.125 rpm = 1500 rpm; 130 − 40 = 90 °C)', () => {
		const rows = decodeRows(frame, Uint8Array.from([130, 0, 0, 0xe0, 0x2e, 0, 0, 0]));
		expect(rows[0]).toMatchObject({
			present: true,
			raw: String(0x2ee0),
			physical: '1500',
			inRange: true
		});
		expect(rows[1]).toMatchObject({ present: true, raw: '130', physical: '90', label: null });
		expect(rows[2]).toMatchObject({ present: false });
	});

	it('shows the value label of the raw value (J1939-71: 0xFF in a byte parameter means not available)', () => {
		const rows = decodeRows(frame, Uint8Array.from([0xff, 0, 0, 0, 0, 0, 0, 0]));
		expect(rows[1]).toMatchObject({ raw: '255', physical: '215', label: 'Not available' });
	});

	it('marks signals past a short payload as absent instead of failing', () => {
		const rows = decodeRows(frame, Uint8Array.from([50]));
		expect(rows.map((r) => r.present)).toEqual([false, true, false]);
	});
});

describe('encodeInto', () => {
	it('encodes 1500 rpm as E0 2E in bytes 3–4 and reads it back (J1939-71 resolution 0.125 rpm/bit)', () => {
		const result = encodeInto(frame, 0, new Uint8Array(8), '1500');
		expect(result.ok).toBe(true);
		if (!result.ok) return;
		expect(Array.from(result.bytes)).toEqual([0, 0, 0, 0xe0, 0x2e, 0, 0, 0]);
		expect(result).toMatchObject({ raw: 12000n, readBack: '1500', clamped: false });
	});

	it('keeps the other bits, pads a short payload to the frame length, and reports clamping', () => {
		const result = encodeInto(frame, 1, Uint8Array.from([1, 2, 3]), '-100');
		expect(result.ok).toBe(true);
		if (!result.ok) return;
		expect(Array.from(result.bytes)).toEqual([0, 2, 3, 0, 0, 0, 0, 0]);
		expect(result).toMatchObject({ clamped: true, readBack: '-40' });
	});

	it('explains non-numbers and fields that do not fit', () => {
		expect(encodeInto(frame, 0, new Uint8Array(8), 'fast')).toEqual({
			ok: false,
			message: '"fast" is not a number'
		});
		const outside = encodeInto(frame, 2, new Uint8Array(8), '1');
		expect(outside.ok).toBe(false);
		if (!outside.ok) expect(outside.message).toMatch(/bytes 8…8 but the payload has 8 byte/);
	});
});

describe('formatPhysical', () => {
	it('hides binary rounding of decimal scales (IEEE 754 doubles: 3 × 0.1 = 0.30000000000000004)', () => {
		expect(3 * 0.1).not.toBe(0.3);
		expect(formatPhysical(3 * 0.1)).toBe('0.3');
		expect(formatPhysical(-0.125)).toBe('-0.125');
	});
});
