import { describe, expect, it } from 'vitest';
import { plotChannels, stripUnit, valueAt } from './plot-series';

describe('valueAt', () => {
	const time = [0, 1, 2, 3];
	const value = [10, 11, null, 13];
	it.each([
		[-0.5, null],
		[0, 10],
		[0.99, 10],
		[1, 11],
		[2.5, null],
		[99, 13]
	])('at %d holds %s', (t, expected) => {
		expect(valueAt(time, value, t)).toBe(expected);
	});
});

describe('plotChannels', () => {
	it('names decoded and derived channels and writes a decoded one as a formula', () => {
		const all = plotChannels(
			[{ index: 3, frameName: 'Engine core', signalName: 'Speed', unit: 'rpm' }],
			[{ name: 'Boost', unit: 'kPa', formula: 'MAP - 101.3' }]
		);
		expect(all.get('c3')).toMatchObject({
			label: 'Engine core · Speed',
			formula: '{Engine core.Speed}'
		});
		expect(all.get('d0')).toMatchObject({ label: 'Boost', derived: true, unit: 'kPa' });
		expect(stripUnit([all.get('c3'), all.get('d0'), all.get('c3')])).toBe('rpm, kPa');
	});
});
