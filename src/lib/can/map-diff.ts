/**
 * Field-by-field differences between two maps: frames are matched by (ID, standard/extended),
 * signals within a frame by name — the identities a receiving device and a person reading the
 * map use. A duplicate (a lint error, but legal in a draft) is matched to its n-th counterpart.
 * Alert rules are matched by their id, so a renamed rule shows as changed, not removed and added.
 */
import { z } from 'zod';
import type { CanMap, Frame, Signal } from './map';
import { formatCanId } from './map-json';

/** One field that differs; `from`/`to` are the field's values (absent fields are null). */
export const fieldChangeSchema = z.object({
	field: z.string(),
	from: z.unknown(),
	to: z.unknown()
});
export type FieldChange = z.infer<typeof fieldChangeSchema>;

const changeStatus = z.enum(['added', 'removed', 'changed']);

export const signalDiffSchema = z.object({
	name: z.string(),
	status: changeStatus,
	changes: z.array(fieldChangeSchema)
});
export type SignalDiff = z.infer<typeof signalDiffSchema>;

export const frameDiffSchema = z.object({
	/** "0x360" (standard) or "0x18FEF100" (extended), with "#2" for a second frame of the same ID. */
	key: z.string(),
	status: z.enum(['added', 'removed', 'changed', 'same']),
	name: z.string(),
	changes: z.array(fieldChangeSchema),
	/** Only signals that differ; unchanged ones are left out. */
	signals: z.array(signalDiffSchema)
});
export type FrameDiff = z.infer<typeof frameDiffSchema>;

export const alertRuleDiffSchema = z.object({
	id: z.string(),
	/** The rule's name (the new one when it changed). */
	name: z.string(),
	status: changeStatus,
	changes: z.array(fieldChangeSchema)
});
export type AlertRuleDiff = z.infer<typeof alertRuleDiffSchema>;

export const mapDiffSchema = z.object({
	/** Map-level fields (name, bitrate). */
	changes: z.array(fieldChangeSchema),
	frames: z.array(frameDiffSchema),
	/** Only rules that differ. */
	alertRules: z.array(alertRuleDiffSchema),
	/** True when nothing at all differs. */
	identical: z.boolean()
});
export type MapDiff = z.infer<typeof mapDiffSchema>;

const MAP_FIELDS = ['name', 'bitrate'] as const satisfies readonly (keyof CanMap)[];
const FRAME_FIELDS = [
	'name',
	'length',
	'cycleMs',
	'sender',
	'j1939',
	'comment'
] as const satisfies readonly (keyof Frame)[];
const SIGNAL_FIELDS = [
	'startBit',
	'length',
	'byteOrder',
	'valueType',
	'scale',
	'offset',
	'unit',
	'min',
	'max',
	'labels',
	'multiplexer',
	'muxValue',
	'spn',
	'comment'
] as const satisfies readonly (keyof Signal)[];
/** Every field of every rule condition; a field the other condition lacks compares as absent (undefined). */
const ALERT_RULE_FIELDS = [
	'name',
	'channel',
	'severity',
	'condition',
	'setpoint',
	'low',
	'high',
	'deadband',
	'onDelayS',
	'offDelayS',
	'latching',
	'message'
] as const;

/** Structural equality for the JSON-like values a map holds (labels compare by content, not key order). */
function sameValue(a: unknown, b: unknown): boolean {
	if (Object.is(a, b)) return true;
	if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return false;
	const ka = Object.keys(a);
	const kb = Object.keys(b);
	return (
		ka.length === kb.length &&
		ka.every(
			(k) =>
				k in b && sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])
		)
	);
}

export function fieldChanges<T, K extends keyof T>(
	a: T,
	b: T,
	fields: readonly K[]
): FieldChange[] {
	return fields
		.filter((f) => !sameValue(a[f], b[f]))
		.map((f) => ({ field: String(f), from: a[f], to: b[f] }));
}

/** Keys items by identity, numbering repeats so each one has a unique key. */
function keyed<T>(items: readonly T[], identity: (item: T) => string): Map<string, T> {
	const seen = new Map<string, number>();
	const out = new Map<string, T>();
	for (const item of items) {
		const id = identity(item);
		const n = (seen.get(id) ?? 0) + 1;
		seen.set(id, n);
		out.set(n === 1 ? id : `${id}#${n}`, item);
	}
	return out;
}

/** Keys of `b` in its order, then keys only `a` has, each in the position its neighbours suggest. */
function mergedKeys(a: Map<string, unknown>, b: Map<string, unknown>): string[] {
	const keys = [...b.keys()];
	let insertAt = 0;
	for (const key of a.keys()) {
		const found = keys.indexOf(key);
		if (found >= 0) insertAt = found + 1;
		else keys.splice(insertAt++, 0, key);
	}
	return keys;
}

function diffSignals(a: readonly Signal[], b: readonly Signal[]): SignalDiff[] {
	const before = keyed(a, (s) => s.name);
	const after = keyed(b, (s) => s.name);
	const out: SignalDiff[] = [];
	for (const key of mergedKeys(before, after)) {
		const from = before.get(key);
		const to = after.get(key);
		if (!from && to) out.push({ name: to.name, status: 'added', changes: [] });
		else if (from && !to) out.push({ name: from.name, status: 'removed', changes: [] });
		else if (from && to) {
			const changes = fieldChanges(from, to, SIGNAL_FIELDS);
			if (changes.length > 0) out.push({ name: to.name, status: 'changed', changes });
		}
	}
	return out;
}

/** An item of a list matched by identity: added, removed, or changed in some fields. */
export const itemDiffSchema = z.object({
	key: z.string(),
	/** The item's name (the new one when it changed). */
	name: z.string(),
	status: changeStatus,
	changes: z.array(fieldChangeSchema)
});
export type ItemDiff = z.infer<typeof itemDiffSchema>;

/**
 * Differences between two lists whose items are matched by `identity` (repeats numbered), in the
 * order of `b` with removed items where they stood; unchanged items are left out.
 */
export function diffItems<T>(
	a: readonly T[],
	b: readonly T[],
	identity: (item: T) => string,
	fields: readonly string[],
	nameOf: (item: T) => string
): (ItemDiff & { item: T })[] {
	const before = keyed(a, identity);
	const after = keyed(b, identity);
	const out: (ItemDiff & { item: T })[] = [];
	for (const key of mergedKeys(before, after)) {
		const from = before.get(key);
		const to = after.get(key);
		const entry = (item: T, status: ItemDiff['status'], changes: FieldChange[] = []) =>
			out.push({ key, name: nameOf(item), status, changes, item });
		if (!from && to) entry(to, 'added');
		else if (from && !to) entry(from, 'removed');
		else if (from && to) {
			const changes = fieldChanges(
				from as Record<string, unknown>,
				to as Record<string, unknown>,
				fields
			);
			if (changes.length > 0) entry(to, 'changed', changes);
		}
	}
	return out;
}

/** Alert rules matched by id, so a renamed rule shows as changed; map rules and device rules alike. */
export function diffAlertRules(
	a: readonly { id: string; name: string }[],
	b: readonly { id: string; name: string }[]
): AlertRuleDiff[] {
	return diffItems(
		a,
		b,
		(r) => r.id,
		ALERT_RULE_FIELDS,
		(r) => r.name
	).map((d) => ({
		id: d.item.id,
		name: d.name,
		status: d.status,
		changes: d.changes
	}));
}

export function diffMaps(a: CanMap, b: CanMap): MapDiff {
	const identity = (f: Frame) => formatCanId(f.id, f.extended);
	const before = keyed(a.frames, identity);
	const after = keyed(b.frames, identity);
	const frames: FrameDiff[] = mergedKeys(before, after).map((key) => {
		const from = before.get(key);
		const to = after.get(key);
		if (!from)
			return {
				key,
				status: 'added',
				name: to!.name,
				changes: [],
				signals: diffSignals([], to!.signals)
			};
		if (!to)
			return {
				key,
				status: 'removed',
				name: from.name,
				changes: [],
				signals: diffSignals(from.signals, [])
			};
		const changes = fieldChanges(from, to, FRAME_FIELDS);
		const signals = diffSignals(from.signals, to.signals);
		return {
			key,
			status: changes.length + signals.length > 0 ? 'changed' : 'same',
			name: to.name,
			changes,
			signals
		};
	});
	const changes = fieldChanges(a, b, MAP_FIELDS);
	const alertRules = diffAlertRules(a.alertRules, b.alertRules);
	return {
		changes,
		frames,
		alertRules,
		identical:
			changes.length === 0 && alertRules.length === 0 && frames.every((f) => f.status === 'same')
	};
}
