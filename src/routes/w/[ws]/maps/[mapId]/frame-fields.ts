/**
 * The frames table's editable fields: how each shows as text in a cell and how typed text becomes a
 * field value again. Every value is checked with the map's own zod schema, so the table can never put
 * into the draft what a save would refuse — and its messages are the schema's.
 */
import { frameSchema, type Frame } from '$lib/can/map';
import { formatCanId } from '$lib/can/map-json';

export type FrameFieldKey = 'id' | 'extended' | 'name' | 'length' | 'cycleMs' | 'sender';

export interface FrameField {
	key: FrameFieldKey;
	label: string;
	editor: 'text' | 'select';
	options?: { value: string; label: string }[];
	show: (frame: Frame) => string;
}

export type FieldEdit = { ok: true; frame: Frame } | { ok: false; message: string };

export const FRAME_FIELDS: FrameField[] = [
	{ key: 'id', label: 'CAN ID', editor: 'text', show: (f) => formatCanId(f.id, f.extended) },
	{
		key: 'extended',
		label: 'Format',
		editor: 'select',
		options: [
			{ value: 'std', label: 'Std (11-bit)' },
			{ value: 'ext', label: 'Ext (29-bit)' }
		],
		show: (f) => (f.extended ? 'Ext' : 'Std')
	},
	{ key: 'name', label: 'Name', editor: 'text', show: (f) => f.name },
	{ key: 'length', label: 'Length (bytes)', editor: 'text', show: (f) => String(f.length) },
	{
		key: 'cycleMs',
		label: 'Cycle (ms)',
		editor: 'text',
		show: (f) => (f.cycleMs === null ? '' : String(f.cycleMs))
	},
	{ key: 'sender', label: 'Sender', editor: 'text', show: (f) => f.sender }
];

/** Text as the person types it → the value the schema parses (hex IDs with or without "0x"). */
function candidate(key: FrameFieldKey, text: string): unknown {
	const t = text.trim();
	switch (key) {
		case 'id':
			return /^[0-9a-fA-F]+$/.test(t) ? `0x${t}` : t;
		case 'extended':
			return t === 'ext';
		case 'length':
			return t === '' ? Number.NaN : Number(t);
		case 'cycleMs':
			return t === '' ? null : Number(t);
		default:
			return t;
	}
}

const fieldSchemas = frameSchema.shape;

/** Applies one edited cell to a frame, or says in words why the text was not accepted. */
export function editFrameField(frame: Frame, key: FrameFieldKey, text: string): FieldEdit {
	const parsed = fieldSchemas[key].safeParse(candidate(key, text));
	if (!parsed.success) {
		const label = FRAME_FIELDS.find((f) => f.key === key)?.label ?? key;
		return { ok: false, message: `${label}: ${parsed.error.issues[0]?.message ?? 'not accepted'}` };
	}
	return { ok: true, frame: { ...frame, [key]: parsed.data } };
}

/** The lowest identifier above those in use (and within the frame's format), for new rows. */
export function nextFreeId(frames: readonly Frame[], extended: boolean, from = 0x100): number {
	const used = new Set(frames.filter((f) => f.extended === extended).map((f) => f.id));
	let id = from;
	while (used.has(id)) id++;
	return id;
}

/** A blank frame with a unique name and identifier, ready to be edited in the table. */
export function newFrame(frames: readonly Frame[]): Frame {
	const names = new Set(frames.map((f) => f.name));
	let n = frames.length + 1;
	while (names.has(`Frame_${n}`)) n++;
	return frameSchema.parse({ name: `Frame_${n}`, id: nextFreeId(frames, false) });
}

/** A copy of a frame (signals included) under a new name and identifier. */
export function duplicateFrame(frames: readonly Frame[], frame: Frame): Frame {
	const names = new Set(frames.map((f) => f.name));
	let name = `${frame.name}_copy`;
	for (let n = 2; names.has(name); n++) name = `${frame.name}_copy${n}`;
	return { ...structuredClone(frame), name, id: nextFreeId(frames, frame.extended, frame.id) };
}
