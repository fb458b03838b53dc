import { describe, expect, it } from 'vitest';
import { frameSchema } from '$lib/can/map';
import { duplicateFrame, editFrameField, FRAME_FIELDS, newFrame, nextFreeId } from './frame-fields';

const frame = frameSchema.parse({
	name: 'EngineFast',
	id: '0x360',
	length: 8,
	cycleMs: 20,
	sender: 'ECU'
});

describe('editFrameField', () => {
	it.each([
		['0x3E8', 0x3e8],
		['3e8', 0x3e8],
		['1000', 0x1000] // typed digits are hex in the ID column, as the column shows them
	])('reads the ID %s as hex', (text, id) => {
		const edit = editFrameField(frame, 'id', text);
		expect(edit).toEqual({ ok: true, frame: { ...frame, id } });
	});

	it('refuses an ID above 29 bits with the schema message', () => {
		const edit = editFrameField(frame, 'id', '0x20000000');
		expect(edit.ok).toBe(false);
		if (!edit.ok) expect(edit.message).toMatch(/^CAN ID: .*0x1FFFFFFF/);
	});

	it('accepts only payload lengths ISO 11898-1 allows (0–8, then CAN FD 12…64)', () => {
		// ISO 11898-1:2015 DLC table (from memory): DLC 9–15 code 12, 16, 20, 24, 32, 48, 64 bytes.
		expect(editFrameField(frame, 'length', '12').ok).toBe(true);
		expect(editFrameField(frame, 'length', '64').ok).toBe(true);
		const nine = editFrameField(frame, 'length', '9');
		expect(nine).toEqual({
			ok: false,
			message: expect.stringMatching(/^Length \(bytes\): payload length must be/)
		});
		expect(editFrameField(frame, 'length', '').ok).toBe(false);
	});

	it('treats an empty cycle time as "not cyclic" and refuses zero', () => {
		expect(editFrameField(frame, 'cycleMs', '')).toEqual({
			ok: true,
			frame: { ...frame, cycleMs: null }
		});
		expect(editFrameField(frame, 'cycleMs', '0').ok).toBe(false);
		expect(editFrameField(frame, 'cycleMs', '12.5')).toEqual({
			ok: true,
			frame: { ...frame, cycleMs: 12.5 }
		});
	});

	it('switches between standard and extended format and refuses an empty name', () => {
		expect(editFrameField(frame, 'extended', 'ext')).toEqual({
			ok: true,
			frame: { ...frame, extended: true }
		});
		expect(editFrameField(frame, 'name', '   ')).toEqual({
			ok: false,
			message: 'Name: a frame needs a name'
		});
	});

	it('shows every field the way it is edited', () => {
		const shown = Object.fromEntries(FRAME_FIELDS.map((f) => [f.key, f.show(frame)]));
		expect(shown).toEqual({
			id: '0x360',
			extended: 'Std',
			name: 'EngineFast',
			length: '8',
			cycleMs: '20',
			sender: 'ECU'
		});
	});
});

describe('new and duplicated frames', () => {
	it('picks the lowest free identifier of the same format', () => {
		const frames = [frame, { ...frame, id: 0x100 }, { ...frame, id: 0x101, extended: true }];
		expect(nextFreeId(frames, false)).toBe(0x101);
		expect(nextFreeId(frames, true)).toBe(0x100);
	});

	it('gives a new frame a unique name and a valid shape', () => {
		const made = newFrame([frame, { ...frame, name: 'Frame_2' }]);
		expect(made.name).toBe('Frame_3');
		expect(frameSchema.parse(made)).toEqual(made);
	});

	it('copies signals into a duplicate without sharing them', () => {
		const withSignal = frameSchema.parse({
			...frame,
			signals: [{ name: 'Rpm', startBit: 0, length: 16 }]
		});
		const copy = duplicateFrame([withSignal], withSignal);
		expect(copy.name).toBe('EngineFast_copy');
		expect(copy.id).toBe(0x361);
		expect(copy.signals).toEqual(withSignal.signals);
		expect(copy.signals[0]).not.toBe(withSignal.signals[0]);
	});
});
