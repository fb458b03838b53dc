import { describe, expect, it } from 'vitest';
import { canMapSchema, type CanMap, type CanMapInput } from './map';
import { diffMaps } from './map-diff';

const base: CanMapInput = {
	format: 'framewright-map@1',
	name: 'Base',
	frames: [
		{
			name: 'A',
			id: '0x100',
			cycleMs: 10,
			signals: [
				{ name: 'S1', startBit: 0, length: 8 },
				{ name: 'S2', startBit: 8, length: 8, labels: { '0': 'Off' } }
			]
		},
		{ name: 'B', id: '0x200', signals: [{ name: 'T', startBit: 0, length: 16 }] },
		{ name: 'C', id: '0x300', signals: [] }
	]
};

function edited(change: (m: CanMap) => void): CanMap {
	const map = canMapSchema.parse(structuredClone(base));
	change(map);
	return map;
}
const original = canMapSchema.parse(base);

describe('diffMaps', () => {
	it('finds nothing between equal maps (labels compare by content)', () => {
		const same = edited((m) => (m.frames[0].signals[1].labels = { '0': 'Off' }));
		const diff = diffMaps(original, same);
		expect(diff.identical).toBe(true);
		expect(diff.frames.map((f) => f.status)).toEqual(['same', 'same', 'same']);
	});

	it('finds an added frame, a removed signal and a changed scale, field by field', () => {
		const next = edited((m) => {
			m.frames[0].signals[0].scale = 0.5;
			m.frames[1].signals = [];
			m.frames.push({ ...m.frames[2], name: 'D', id: 0x400 });
		});
		const diff = diffMaps(original, next);
		expect(diff.identical).toBe(false);
		expect(diff.frames).toEqual([
			{
				key: '0x100',
				status: 'changed',
				name: 'A',
				changes: [],
				signals: [
					{ name: 'S1', status: 'changed', changes: [{ field: 'scale', from: 1, to: 0.5 }] }
				]
			},
			{
				key: '0x200',
				status: 'changed',
				name: 'B',
				changes: [],
				signals: [{ name: 'T', status: 'removed', changes: [] }]
			},
			{ key: '0x300', status: 'same', name: 'C', changes: [], signals: [] },
			{ key: '0x400', status: 'added', name: 'D', changes: [], signals: [] }
		]);
	});

	it('keeps a removed frame where it was and lists frame and map field changes', () => {
		const next = edited((m) => {
			m.name = 'Renamed';
			m.bitrate = 250_000;
			m.frames.splice(1, 1);
			m.frames[0].cycleMs = 20;
			m.frames[0].signals[1].labels = { '0': 'Off', '1': 'On' };
		});
		const diff = diffMaps(original, next);
		expect(diff.changes).toEqual([
			{ field: 'name', from: 'Base', to: 'Renamed' },
			{ field: 'bitrate', from: 500_000, to: 250_000 }
		]);
		expect(diff.frames.map((f) => [f.key, f.status])).toEqual([
			['0x100', 'changed'],
			['0x200', 'removed'],
			['0x300', 'same']
		]);
		expect(diff.frames[0].changes).toEqual([{ field: 'cycleMs', from: 10, to: 20 }]);
		expect(diff.frames[0].signals[0]).toEqual({
			name: 'S2',
			status: 'changed',
			changes: [{ field: 'labels', from: { '0': 'Off' }, to: { '0': 'Off', '1': 'On' } }]
		});
		expect(diff.frames[1].signals).toEqual([{ name: 'T', status: 'removed', changes: [] }]);
	});

	it('treats the same number as a different frame when standard vs extended changes, and a renamed signal as removed + added', () => {
		const next = edited((m) => {
			m.frames[2].extended = true;
			m.frames[1].signals[0].name = 'T2';
		});
		const diff = diffMaps(original, next);
		expect(diff.frames.map((f) => [f.key, f.status])).toEqual([
			['0x100', 'same'],
			['0x200', 'changed'],
			['0x300', 'removed'],
			['0x00000300', 'added']
		]);
		expect(diff.frames[1].signals.map((s) => [s.name, s.status])).toEqual([
			['T', 'removed'],
			['T2', 'added']
		]);
	});

	it('matches duplicated IDs by occurrence, so a second copy is an addition', () => {
		const next = edited((m) => m.frames.push({ ...structuredClone(m.frames[0]), name: 'A copy' }));
		expect(diffMaps(original, next).frames.map((f) => [f.key, f.status, f.name])).toEqual([
			['0x100', 'same', 'A'],
			['0x200', 'same', 'B'],
			['0x300', 'same', 'C'],
			['0x100#2', 'added', 'A copy']
		]);
	});

	describe('alert rules', () => {
		const hot = {
			id: 'hot',
			name: 'Hot',
			channel: { frame: 'A', signal: 'S1' },
			severity: 'advisory',
			condition: 'above',
			setpoint: 100
		} as const;
		const withRules = (rules: unknown[]) =>
			canMapSchema.parse({ ...structuredClone(base), alertRules: rules });

		it('are matched by id: a renamed rule with a new setpoint is changed, field by field', () => {
			const diff = diffMaps(
				withRules([hot]),
				withRules([{ ...hot, name: 'Very hot', setpoint: 110 }])
			);
			expect(diff.identical).toBe(false);
			expect(diff.alertRules).toEqual([
				{
					id: 'hot',
					name: 'Very hot',
					status: 'changed',
					changes: [
						{ field: 'name', from: 'Hot', to: 'Very hot' },
						{ field: 'setpoint', from: 100, to: 110 }
					]
				}
			]);
		});

		it('finds added and removed rules, and a condition change with fields that appear or vanish', () => {
			const { setpoint: _unused, ...common } = hot;
			const band = { ...common, condition: 'outside', low: 10, high: 90 };
			const cold = { ...hot, id: 'cold', name: 'Cold', condition: 'below', setpoint: 5 };
			const diff = diffMaps(
				withRules([hot, cold]),
				withRules([band, { ...hot, id: 'new', name: 'New' }])
			);
			expect(diff.alertRules.map((r) => [r.id, r.status])).toEqual([
				['hot', 'changed'],
				['cold', 'removed'],
				['new', 'added']
			]);
			expect(diff.alertRules[0].changes).toEqual([
				{ field: 'condition', from: 'above', to: 'outside' },
				{ field: 'setpoint', from: 100, to: undefined },
				{ field: 'low', from: undefined, to: 10 },
				{ field: 'high', from: undefined, to: 90 }
			]);
		});

		it('equal rules (channel compared by content) leave the maps identical', () => {
			const diff = diffMaps(withRules([hot]), withRules([structuredClone(hot)]));
			expect(diff).toMatchObject({ identical: true, alertRules: [] });
		});
	});
});
