import { describe, expect, it } from 'vitest';
import { signalSchema } from '$lib/can/map';
import { applyFieldText, fieldText, formatLabels, newSignal, parseLabels } from './signal-fields';

const base = signalSchema.parse({
	name: 'CoolantTemp',
	startBit: 8,
	length: 8,
	scale: 1,
	offset: -40,
	unit: '°C'
});

describe('applyFieldText', () => {
	it('sets numbers, optional numbers and text through the map schema', () => {
		const scaled = applyFieldText(base, 'scale', '0.5');
		expect(scaled.ok && scaled.signal.scale).toBe(0.5);
		const noMax = applyFieldText({ ...base, max: 120 }, 'max', ' ');
		expect(noMax.ok && noMax.signal.max).toBeNull();
		const renamed = applyFieldText(base, 'name', 'EngineCoolant');
		expect(renamed.ok && renamed.signal.name).toBe('EngineCoolant');
	});

	it('reports the schema’s own message for out-of-range values', () => {
		expect(applyFieldText(base, 'length', '65')).toEqual({
			ok: false,
			message: 'must be 1–64 bits'
		});
		expect(applyFieldText(base, 'startBit', '2.5')).toEqual({
			ok: false,
			message: 'must be a whole number'
		});
		expect(applyFieldText(base, 'name', '  ')).toEqual({
			ok: false,
			message: 'a signal needs a name'
		});
	});

	it('takes a J1939 SPN of 0…524287 (19 bits, SAE J1939-71 — from memory) and an empty one as none', () => {
		for (const [text, spn] of [
			['0', 0],
			['190', 190],
			['524287', 0x7ffff]
		] as const) {
			const set = applyFieldText(base, 'spn', text);
			expect(set.ok && set.signal.spn).toBe(spn);
		}
		const cleared = applyFieldText({ ...base, spn: 190 }, 'spn', '');
		expect(cleared.ok && cleared.signal.spn).toBeNull();
		for (const text of ['524288', '-1', '1.5']) {
			expect(applyFieldText(base, 'spn', text)).toEqual({
				ok: false,
				message: 'an SPN is a whole number 0…524287 (19 bits)'
			});
		}
	});

	it('refuses text that is not a number, and an empty required number', () => {
		expect(applyFieldText(base, 'offset', 'minus forty')).toEqual({
			ok: false,
			message: '"minus forty" is not a number'
		});
		expect(applyFieldText(base, 'scale', '')).toEqual({ ok: false, message: 'enter a number' });
	});

	it('never changes the signal it was given', () => {
		applyFieldText(base, 'scale', '2');
		expect(base.scale).toBe(1);
	});
});

describe('labels text', () => {
	it('round-trips 0=Off;1=On, escaping ; and = inside names like the CSV signal table', () => {
		const tricky = { '0': 'a;b', '1': 'x=y' };
		const text = formatLabels(tricky);
		expect(parseLabels(text)).toEqual({ ok: true, labels: tricky });
		const parsed = parseLabels('1=On; 0=Off');
		expect(parsed).toEqual({ ok: true, labels: { '0': 'Off', '1': 'On' } });
		expect(parsed.ok && formatLabels(parsed.labels)).toBe('0=Off;1=On');
		expect(fieldText({ ...base, labels: { '-1': 'Error', '2': 'Two' } }, 'labels')).toBe(
			'-1=Error;2=Two'
		);
	});

	it('explains a label without a whole-number raw value', () => {
		const result = parseLabels('0=Off;On');
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.message).toMatch(/"On" is not raw=name/);
	});
});

describe('newSignal', () => {
	it('takes the first free bits, up to a byte, with an unused name', () => {
		const frame = {
			length: 2,
			signals: [signalSchema.parse({ name: 'Signal_2', startBit: 0, length: 4 })]
		};
		const added = newSignal(frame);
		expect(added).toMatchObject({ name: 'Signal_3', startBit: 4, length: 8, byteOrder: 'little' });
	});

	it('stops before a used bit and before the payload end', () => {
		const frame = {
			length: 1,
			signals: [signalSchema.parse({ name: 'A', startBit: 5, length: 1 })]
		};
		expect(newSignal(frame)).toMatchObject({ startBit: 0, length: 5 });
		const full = {
			length: 1,
			signals: [signalSchema.parse({ name: 'A', startBit: 0, length: 8 })]
		};
		expect(newSignal(full)).toMatchObject({ startBit: 0, length: 8 });
	});
});
