/**
 * The decode panel's choices and the channel tables' grouping: which map and revision to offer first,
 * channels grouped by frame, and two decodes' channel statistics side by side (switch revision and
 * compare), matched by frame and signal name because indices shift when a revision adds a signal.
 */
import type { ChannelSummary as ChannelStats, DecodeRevision } from '$lib/api/capture-views';
import type { DecodeRecord } from '$lib/api/captures';

export interface MapChoice {
	id: string;
	name: string;
	/** Published revision numbers, newest first. */
	revisions: number[];
}

/**
 * The map of the newest decode when it still exists (a person usually re-decodes with the same map),
 * else the first map that has a published revision, else the first map's draft; always the latest revision.
 */
export function defaultDecodeChoice(
	maps: MapChoice[],
	decodes: Pick<DecodeRecord, 'mapId'>[]
): { mapId: string; revision: DecodeRevision } | null {
	const latest = (m: MapChoice): DecodeRevision => m.revisions[0] ?? 'draft';
	const used = decodes.find((d) => d.mapId !== null && maps.some((m) => m.id === d.mapId));
	const map =
		maps.find((m) => m.id === used?.mapId) ?? maps.find((m) => m.revisions.length > 0) ?? maps[0];
	return map ? { mapId: map.id, revision: latest(map) } : null;
}

export interface FrameGroup {
	frameName: string;
	channels: ChannelStats[];
}

/** Channels of one frame together, frames in the order the map lists them. */
export function groupByFrame(channels: readonly ChannelStats[]): FrameGroup[] {
	const groups = new Map<string, ChannelStats[]>();
	for (const c of channels) {
		const list = groups.get(c.frameName);
		if (list) list.push(c);
		else groups.set(c.frameName, [c]);
	}
	return [...groups].map(([frameName, list]) => ({ frameName, channels: list }));
}

export interface ComparedChannel {
	frameName: string;
	signalName: string;
	a: ChannelStats | null;
	b: ChannelStats | null;
	/** The two decodes disagree on this channel (missing on one side, another unit or other figures). */
	differs: boolean;
}

const FIGURES = [
	'unit',
	'count',
	'min',
	'max',
	'mean',
	'last',
	'outOfRange',
	'limitMin',
	'limitMax'
] as const;

/** Every channel of either decode once, in a's order then b's new ones, with whether they differ. */
export function compareChannels(
	a: readonly ChannelStats[],
	b: readonly ChannelStats[]
): ComparedChannel[] {
	const key = (c: ChannelStats) => `${c.frameName}\u0000${c.signalName}`;
	const inB = new Map(b.map((c) => [key(c), c]));
	const rows: ComparedChannel[] = [];
	const seen = new Set<string>();
	for (const c of [...a, ...b]) {
		const k = key(c);
		if (seen.has(k)) continue;
		seen.add(k);
		const left = a.find((x) => key(x) === k) ?? null;
		const right = inB.get(k) ?? null;
		const differs = !left || !right || FIGURES.some((f) => left[f] !== right[f]);
		rows.push({ frameName: c.frameName, signalName: c.signalName, a: left, b: right, differs });
	}
	return rows;
}
