/**
 * The workbench plot's channels: decoded (`c<n>`) and derived (`d<n>`) references resolved to
 * names, units and print precision, and the value a channel holds at the cursor.
 */
import type { ChannelSummary } from '$lib/api/capture-views';
import type { ChannelRef, DerivedDefinition } from '$lib/api/workbench';
import type { ValuePrecision } from '$lib/value-format';

export interface TraceSeries {
	label: string;
	colour: string;
	dash: number[];
	time: number[];
	value: (number | null)[];
}

export interface PlotChannel {
	ref: ChannelRef;
	/** `Frame · Signal`, or the derived channel's name. */
	label: string;
	unit: string;
	precision?: ValuePrecision;
	/** The formula that yields it: a decoded channel is `{Frame.Signal}`. */
	formula: string;
	derived: boolean;
}

/** Every channel the workbench can plot, by reference. */
export function plotChannels(
	channels: readonly Pick<
		ChannelSummary,
		'index' | 'frameName' | 'signalName' | 'unit' | 'precision'
	>[],
	derived: readonly DerivedDefinition[]
): Map<ChannelRef, PlotChannel> {
	const out = new Map<ChannelRef, PlotChannel>();
	for (const c of channels)
		out.set(`c${c.index}`, {
			ref: `c${c.index}`,
			label: `${c.frameName} · ${c.signalName}`,
			unit: c.unit,
			precision: c.precision,
			formula: `{${c.frameName}.${c.signalName}}`,
			derived: false
		});
	derived.forEach((d, k) =>
		out.set(`d${k}`, {
			ref: `d${k}`,
			label: d.name,
			unit: d.unit,
			precision: { kind: 'computed' },
			formula: d.formula,
			derived: true
		})
	);
	return out;
}

/**
 * The value a channel holds at time t: its latest point at or before t (a CAN value stays until
 * the next frame), or null before its first point. Points are in time order (binary search).
 */
export function valueAt(
	time: readonly number[],
	value: readonly (number | null)[],
	t: number
): number | null {
	let lo = 0;
	let hi = time.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (time[mid] <= t) lo = mid + 1;
		else hi = mid;
	}
	return lo === 0 ? null : value[lo - 1];
}

/** A strip's axis label: its channels' units, each once. */
export function stripUnit(channels: readonly (PlotChannel | undefined)[]): string {
	return [...new Set(channels.map((c) => c?.unit ?? '').filter(Boolean))].join(', ');
}
