/**
 * Editing one signal field from the text a person typed. The value is checked with the map's own
 * zod `signalSchema`, so the editor accepts exactly what the JSON import and the API accept and
 * reports the schema's message.
 */
import { fieldBitPositions } from '$lib/can/bits';
import { signalSchema, type Frame, type Signal } from '$lib/can/map';
import { labelsText, readLabels } from '$lib/can/signal-table-csv';

export type SignalField = keyof Signal;

type Kind =
	'text' | 'integer' | 'number' | 'optional-number' | 'optional-integer' | 'boolean' | 'labels';

const KINDS: Record<SignalField, Kind> = {
	name: 'text',
	startBit: 'integer',
	length: 'integer',
	byteOrder: 'text',
	valueType: 'text',
	scale: 'number',
	offset: 'number',
	unit: 'text',
	min: 'optional-number',
	max: 'optional-number',
	labels: 'labels',
	multiplexer: 'boolean',
	muxValue: 'optional-integer',
	spn: 'optional-integer',
	role: 'text',
	comment: 'text'
};

/** Value labels as one line, `0=Off;1=On` — the CSV signal table's notation, from its own module. */
export function formatLabels(labels: Signal['labels']): string {
	return labelsText(labels);
}

export function parseLabels(
	text: string
): { ok: true; labels: Record<string, string> } | { ok: false; message: string } {
	const read = readLabels(text);
	return read.ok
		? { ok: true, labels: read.value as Record<string, string> }
		: { ok: false, message: read.message ?? 'not raw=text pairs' };
}

export function fieldText(signal: Signal, field: SignalField): string {
	const value = signal[field];
	if (field === 'labels') return formatLabels(signal.labels);
	return value === null ? '' : String(value);
}

export type FieldEdit = { ok: true; signal: Signal } | { ok: false; message: string };

function valueFromText(
	kind: Kind,
	text: string
): { ok: true; value: unknown } | { ok: false; message: string } {
	const trimmed = text.trim();
	switch (kind) {
		case 'text':
			return { ok: true, value: text };
		case 'boolean':
			return { ok: true, value: trimmed === 'true' };
		case 'labels': {
			const parsed = parseLabels(text);
			return parsed.ok ? { ok: true, value: parsed.labels } : parsed;
		}
		default: {
			if (trimmed === '') {
				return kind.startsWith('optional')
					? { ok: true, value: null }
					: { ok: false, message: 'enter a number' };
			}
			const n = Number(trimmed);
			return Number.isNaN(n)
				? { ok: false, message: `"${trimmed}" is not a number` }
				: { ok: true, value: n };
		}
	}
}

/** The signal with `field` set from `text`, or the reason the text is not acceptable. */
export function applyFieldText(signal: Signal, field: SignalField, text: string): FieldEdit {
	const value = valueFromText(KINDS[field], text);
	if (!value.ok) return value;
	const parsed = signalSchema.safeParse({ ...signal, [field]: value.value });
	if (parsed.success) return { ok: true, signal: parsed.data };
	const issue = parsed.error.issues.find((i) => i.path[0] === field) ?? parsed.error.issues[0];
	return { ok: false, message: issue.message };
}

/** "Signal_3" style name not yet used in the frame. */
export function unusedSignalName(frame: Pick<Frame, 'signals'>): string {
	const taken = new Set(frame.signals.map((s) => s.name));
	let n = frame.signals.length + 1;
	while (taken.has(`Signal_${n}`)) n++;
	return `Signal_${n}`;
}

/**
 * A new little-endian signal on the first payload bit no signal uses, one byte long (shorter if the
 * payload ends first); at bit 0 when the payload is full, where the overlap will be flagged.
 */
export function newSignal(
	frame: Pick<Frame, 'signals' | 'length'>,
	field?: { startBit: number; length: number; byteOrder?: Signal['byteOrder'] }
): Signal {
	const base = { name: unusedSignalName(frame) };
	if (field) return signalSchema.parse({ ...base, ...field });
	const used = new Set(
		frame.signals.flatMap((s) => fieldBitPositions(s.startBit, s.length, s.byteOrder))
	);
	const bits = frame.length * 8;
	let start = 0;
	while (start < bits && used.has(start)) start++;
	if (start >= bits)
		return signalSchema.parse({ ...base, startBit: 0, length: Math.max(1, Math.min(8, bits)) });
	let length = 1;
	while (length < 8 && start + length < bits && !used.has(start + length)) length++;
	return signalSchema.parse({ ...base, startBit: start, length });
}

/** The byte orders as the editors offer them. */
export const BYTE_ORDER_OPTIONS = [
	{ value: 'little', label: 'little-endian' },
	{ value: 'big', label: 'big-endian' }
];
