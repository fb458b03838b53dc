import { describe, expect, it } from 'vitest';
import { frameSchema, type Frame } from '$lib/can/map';
import {
	describeJ1939,
	editJ1939Field,
	j1939Parts,
	j1939Texts,
	readNumber,
	setJ1939
} from './j1939-fields';

const frame = (id: number, extended = true, j1939 = true): Frame =>
	frameSchema.parse({ name: 'F', id, extended, j1939 });

function edited(f: Frame, key: Parameters<typeof editJ1939Field>[1], text: string): number {
	const edit = editJ1939Field(f, key, text);
	if (!edit.ok) throw new Error(edit.message);
	return edit.frame.id;
}

function refusal(f: Frame, key: Parameters<typeof editJ1939Field>[1], text: string): string {
	const edit = editJ1939Field(f, key, text);
	if (edit.ok) throw new Error(`accepted ${text}`);
	return edit.message;
}

describe('J1939 identifier fields (SAE J1939-21 29-bit layout)', () => {
	// SAE J1939-71 EEC1: PGN 61444 = 0xF004, priority 3, engine source address 0 → 0x0CF00400
	// (from memory; the same value is the check in src/lib/can/j1939.test.ts).
	const eec1 = frame(0x0cf00400);

	it('shows the parts of an ID and names PF/PS', () => {
		const parts = j1939Parts(eec1)!;
		expect(j1939Texts(parts)).toEqual({
			priority: '3',
			pgn: '0xF004',
			sourceAddress: '0x00',
			destinationAddress: ''
		});
		expect(describeJ1939(parts)).toBe(
			'PGN 61444 = EDP 0 · DP 0 · PF 0xF0 · PS 0x04 (PDU2, group extension)'
		);
		expect(j1939Parts(frame(0x123, false))).toBeNull();
	});

	it('composes the ID from each edited part', () => {
		// Built from the bit layout: priority in bits 28–26, PGN in 25–8, SA in 7–0.
		expect(edited(eec1, 'priority', '6')).toBe((6 << 26) | (0xf004 << 8) | 0x00);
		expect(edited(eec1, 'sourceAddress', '0x17')).toBe(0x0cf00417);
		expect(edited(eec1, 'sourceAddress', '23')).toBe(0x0cf00417);
		// SAE J1939-71 ET1, PGN 65262 = 0xFEEE (from memory), typed in decimal.
		expect(edited(eec1, 'pgn', '65262')).toBe(0x0cfeee00);
		expect(edited(eec1, 'pgn', 'FEEEh')).toBe(0x0cfeee00);
	});

	it('moves between PDU2 and PDU1: a PDU1 PGN gets a destination, global unless one is given', () => {
		// SAE J1939-21 request PGN 59904 = 0xEA00 is PDU1 (PF 0xEA < 240): PS = destination.
		const request = edited(eec1, 'pgn', '0xEA00');
		expect(request).toBe(0x0ceaff00);
		const toEngine = frame(request);
		expect(j1939Texts(j1939Parts(toEngine)!).destinationAddress).toBe('0xFF');
		expect(edited(toEngine, 'destinationAddress', '0x21')).toBe(0x0cea2100);
		// Back to a PDU2 PGN: the PS byte is the PGN's group extension, no destination remains.
		const back = frame(edited(frame(0x0cea2100), 'pgn', '0xF004'));
		expect(back.id).toBe(0x0cf00400);
		expect(j1939Parts(back)!.destinationAddress).toBeNull();
	});

	it('keeps EDP and DP in the PGN (bits 25 and 24)', () => {
		const id = edited(eec1, 'pgn', '0x3FF12');
		expect(id).toBe(0x0fff1200);
		expect(j1939Parts(frame(id))).toMatchObject({ edp: 1, dp: 1, pf: 0xff, ps: 0x12 });
	});

	it('refuses nonsense with a message naming the field, and changes nothing', () => {
		expect(refusal(eec1, 'priority', '8')).toMatch(/^Priority: .*0…7/);
		expect(refusal(eec1, 'priority', '')).toMatch(/^Priority: enter a value/);
		expect(refusal(eec1, 'sourceAddress', '256')).toMatch(/^Source address: .*0…255/);
		expect(refusal(eec1, 'sourceAddress', 'engine')).toMatch(/“engine” is not a number/);
		expect(refusal(eec1, 'pgn', '0x40000')).toMatch(/^PGN: .*0x3FFFF/);
		// PDU1 with a non-zero PS in the PGN: the PS byte is the destination, not part of the PGN.
		expect(refusal(eec1, 'pgn', '0xEA12')).toMatch(/^PGN: .*zero low byte/);
		// PDU2 is broadcast: no destination.
		expect(refusal(eec1, 'destinationAddress', '5')).toMatch(/PDU2 .*no destination/);
		expect(refusal(frame(0x0ceaff00), 'destinationAddress', '')).toMatch(/0xFF = global/);
		expect(refusal(frame(0x360, false), 'priority', '3')).toMatch(/standard/);
	});

	it('switches J1939 on only for extended frames, and off for any', () => {
		expect(setJ1939(frame(0x0cf00400, true, false), true)).toMatchObject({
			ok: true,
			frame: { j1939: true, id: 0x0cf00400 }
		});
		expect(setJ1939(frame(0x360, false, false), true)).toMatchObject({
			ok: false,
			message: expect.stringMatching(/29-bit/)
		});
		expect(setJ1939(frame(0x360, false, true), false)).toMatchObject({
			ok: true,
			frame: { j1939: false }
		});
	});

	it('reads decimal, 0x-hex and h-suffix hex, and nothing else', () => {
		expect(readNumber(' 61444 ')).toEqual({ ok: true, value: 61444 });
		expect(readNumber('0xf004')).toEqual({ ok: true, value: 0xf004 });
		expect(readNumber('F004h')).toEqual({ ok: true, value: 0xf004 });
		expect(readNumber('')).toEqual({ ok: true, value: null });
		expect(readNumber('-1').ok).toBe(false);
		expect(readNumber('1.5').ok).toBe(false);
		expect(readNumber('F004').ok).toBe(false);
	});

	it('round-trips every priority and a spread of PGNs and addresses through text', () => {
		let checked = 0;
		for (let priority = 0; priority < 8; priority++) {
			for (let pf = 0; pf < 256; pf += 13) {
				const ps = (pf * 29) & 0xff;
				const sa = (pf * 7 + priority) & 0xff;
				const id = priority * 0x4000000 + pf * 0x10000 + ps * 0x100 + sa;
				const f = frame(id);
				const texts = j1939Texts(j1939Parts(f)!);
				// Typing the shown text back, field by field, gives the same ID.
				let again = frame(0);
				for (const key of ['pgn', 'destinationAddress', 'priority', 'sourceAddress'] as const) {
					if (key === 'destinationAddress' && texts[key] === '') continue;
					again = frame(edited(again, key, texts[key]));
				}
				expect(again.id).toBe(id);
				checked++;
			}
		}
		expect(checked).toBe(8 * 20);
	});
});
