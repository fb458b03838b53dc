/**
 * The frame page's J1939 identifier editor: the 29-bit ID shown as priority, PGN (EDP, DP, PF, PS),
 * source address and — for PDU1 — destination address (SAE J1939-21 layout, docs/map-format.md),
 * and typed text turned back into an ID. Parsing and composing are `parseJ1939Id` / `buildJ1939Id`
 * of the pure library; this module only reads the person's text and words the refusals. A refused
 * edit returns a message and no frame, so the draft never changes on bad input.
 */
import {
	buildJ1939Id,
	isPdu1,
	j1939IdPartsSchema,
	parseJ1939Id,
	type J1939Id,
	type J1939IdParts
} from '$lib/can/j1939';
import type { Frame } from '$lib/can/map';

export type J1939FieldKey = 'priority' | 'pgn' | 'sourceAddress' | 'destinationAddress';

export const J1939_FIELDS: { key: J1939FieldKey; label: string; hint: string }[] = [
	{ key: 'priority', label: 'Priority', hint: '0 (highest) … 7' },
	{ key: 'pgn', label: 'PGN', hint: 'decimal (61444) or hex (0xF004)' },
	{ key: 'sourceAddress', label: 'Source address', hint: '0…255, decimal or hex' },
	{
		key: 'destinationAddress',
		label: 'Destination address',
		hint: 'PDU1 only (PF < 240); 0xFF = global'
	}
];

export type FrameEdit = { ok: true; frame: Frame } | { ok: false; message: string };

const hex = (n: number, digits: number) =>
	`0x${n.toString(16).toUpperCase().padStart(digits, '0')}`;

/** The ID's J1939 parts, or null when the frame cannot carry them (a standard 11-bit ID). */
export function j1939Parts(frame: Pick<Frame, 'id' | 'extended'>): J1939Id | null {
	return frame.extended ? parseJ1939Id(frame.id) : null;
}

/** How each field shows in its input: priority in decimal, PGN and addresses in hex. */
export function j1939Texts(parts: J1939Id): Record<J1939FieldKey, string> {
	return {
		priority: String(parts.priority),
		pgn: hex(parts.pgn, 4),
		sourceAddress: hex(parts.sourceAddress, 2),
		destinationAddress: parts.destinationAddress === null ? '' : hex(parts.destinationAddress, 2)
	};
}

/** One line naming every part, e.g. "PGN 61444 = EDP 0 · DP 0 · PF 0xF0 · PS 0x04 (PDU2, group extension)". */
export function describeJ1939(parts: J1939Id): string {
	const pdu1 = parts.destinationAddress !== null;
	return (
		`PGN ${parts.pgn} = EDP ${parts.edp} · DP ${parts.dp} · PF ${hex(parts.pf, 2)} · ` +
		`PS ${hex(parts.ps, 2)} (${pdu1 ? 'PDU1, destination address' : 'PDU2, group extension'})`
	);
}

/**
 * A whole number as people write them: decimal (`61444`), hex with `0x` (`0xF004`) or with an `h`
 * suffix (`F004h`). Empty text is `null`.
 */
export function readNumber(text: string): { ok: true; value: number | null } | { ok: false } {
	const t = text.trim();
	if (t === '') return { ok: true, value: null };
	if (/^0x[0-9a-f]+$/i.test(t)) return { ok: true, value: parseInt(t.slice(2), 16) };
	if (/^[0-9a-f]+h$/i.test(t)) return { ok: true, value: parseInt(t.slice(0, -1), 16) };
	if (/^\d+$/.test(t)) return { ok: true, value: Number(t) };
	return { ok: false };
}

/** Turns the J1939 switch on or off; only an extended frame can be switched on. */
export function setJ1939(frame: Frame, on: boolean): FrameEdit {
	if (on && !frame.extended) {
		return {
			ok: false,
			message:
				'J1939 uses 29-bit identifiers: make the frame extended (Format “Ext” in the frames table) first.'
		};
	}
	return { ok: true, frame: { ...frame, j1939: on } };
}

/**
 * The frame with one J1939 part replaced and its ID composed again, or why the text was refused.
 * Changing the PGN between PDU1 and PDU2 decides whether there is a destination: a PDU1 PGN keeps
 * the frame's destination (global 0xFF when it had none), a PDU2 PGN drops it.
 */
export function editJ1939Field(frame: Frame, key: J1939FieldKey, text: string): FrameEdit {
	const current = j1939Parts(frame);
	if (!current) {
		return { ok: false, message: 'A standard (11-bit) ID has no J1939 parts.' };
	}
	const label = J1939_FIELDS.find((f) => f.key === key)!.label;
	const read = readNumber(text);
	if (!read.ok) {
		return {
			ok: false,
			message: `${label}: “${text.trim()}” is not a number — write decimal (61444) or hex (0xF004).`
		};
	}
	if (read.value === null && key !== 'destinationAddress') {
		return { ok: false, message: `${label}: enter a value.` };
	}
	const parts: J1939IdParts = {
		priority: current.priority,
		pgn: current.pgn,
		sourceAddress: current.sourceAddress,
		destinationAddress: current.destinationAddress
	};
	if (key === 'pgn' && read.value !== null) {
		parts.pgn = read.value;
		// The PGN's own PF decides PDU1/PDU2; an out-of-range PGN is left for the schema to word.
		if (read.value >= 0 && read.value <= 0x3ffff) {
			parts.destinationAddress = isPdu1(read.value) ? (current.destinationAddress ?? 0xff) : null;
		}
	} else if (key === 'destinationAddress') {
		if (read.value === null && current.destinationAddress !== null) {
			return {
				ok: false,
				message: `${label}: a PDU1 PGN is sent to an address — enter 0…255 (0xFF = global).`
			};
		}
		parts.destinationAddress = read.value;
	} else {
		parts[key] = read.value!;
	}
	const checked = j1939IdPartsSchema.safeParse(parts);
	if (!checked.success) {
		const message = checked.error.issues[0].message;
		return {
			ok: false,
			message: `${label}: ${message.charAt(0).toUpperCase()}${message.slice(1)}.`
		};
	}
	return { ok: true, frame: { ...frame, id: buildJ1939Id(checked.data) } };
}
