import { describe, expect, it } from 'vitest';
import type { ChannelSummary as ChannelStats } from '$lib/api/capture-views';
import { compareChannels, defaultDecodeChoice, groupByFrame } from './decode-model';

const channel = (
	index: number,
	frameName: string,
	signalName: string,
	over: Partial<ChannelStats> = {}
): ChannelStats => ({
	index,
	frameName,
	signalName,
	unit: 'kPa',
	count: 10,
	min: 1,
	max: 5,
	mean: 3,
	last: 4,
	outOfRange: 0,
	limitMin: 0,
	limitMax: 10,
	notAvailable: 0,
	errors: 0,
	role: 'value',
	...over
});

const maps = [
	{ id: 'draft-only', name: 'A new map', revisions: [] },
	{ id: 'racer', name: 'Racer', revisions: [3, 2, 1] },
	{ id: 'genset', name: 'Genset', revisions: [1] }
];

describe('default decode choice', () => {
	it('offers the latest revision of the first published map when nothing was decoded yet', () => {
		expect(defaultDecodeChoice(maps, [])).toEqual({ mapId: 'racer', revision: 3 });
	});

	it('prefers the map of the newest decode, skipping decodes of deleted maps', () => {
		expect(
			defaultDecodeChoice(maps, [{ mapId: null }, { mapId: 'genset' }, { mapId: 'racer' }])
		).toEqual({ mapId: 'genset', revision: 1 });
	});

	it('falls back to a draft, and to nothing without maps', () => {
		expect(defaultDecodeChoice([maps[0]], [])).toEqual({ mapId: 'draft-only', revision: 'draft' });
		expect(defaultDecodeChoice([], [])).toBeNull();
	});
});

describe('channels', () => {
	it('groups channels by frame in map order', () => {
		const groups = groupByFrame([
			channel(0, 'Engine', 'Rpm'),
			channel(1, 'Temps', 'Oil'),
			channel(2, 'Engine', 'Tps')
		]);
		expect(groups.map((g) => [g.frameName, g.channels.map((c) => c.signalName)])).toEqual([
			['Engine', ['Rpm', 'Tps']],
			['Temps', ['Oil']]
		]);
	});

	it('compares two decodes by frame and signal name, flagging exactly the channels that changed', () => {
		const r1 = [
			channel(0, 'Engine', 'Rpm'),
			channel(1, 'Engine', 'Tps'),
			channel(2, 'Temps', 'Oil')
		];
		// r2 inserts a signal (indices shift), rescales Tps and drops Oil.
		const r2 = [
			channel(0, 'Engine', 'Rpm'),
			channel(1, 'Engine', 'Map'),
			channel(2, 'Engine', 'Tps', { max: 50, mean: 30 })
		];
		const rows = compareChannels(r1, r2);
		expect(rows.map((r) => [r.signalName, r.differs])).toEqual([
			['Rpm', false],
			['Tps', true],
			['Oil', true],
			['Map', true]
		]);
		expect(rows[2].b).toBeNull();
		expect(rows[3].a).toBeNull();
		expect(rows[1].b?.max).toBe(50);
	});
});
