import { describe, expect, it } from 'vitest';
import { workbenchStateSchema } from '$lib/api/workbench';
import { defaultState, stateFromSearch, stateToSearch, withoutDerived } from './workbench-state';

describe('the workbench state in the URL', () => {
	it('reads back what it wrote', () => {
		const state = workbenchStateSchema.parse({
			decode: 'abc',
			panel: 'frames',
			dock: 'below',
			strips: [['c1', 'c2'], ['d0']],
			from: 1.5,
			to: 3.25,
			derived: [{ name: 'Boost', unit: 'kPa', formula: 'ManifoldPressure - 101.3 | 0' }],
			tool: 'xy',
			x: 'c1',
			y: 'd0',
			above: 100
		});
		const url = new URL(`https://example.test/?${stateToSearch(state)}`);
		expect(stateFromSearch(url.searchParams)).toEqual(state);
	});

	it('writes nothing for the default view and reads an empty query as the default', () => {
		expect(stateToSearch(defaultState()).toString()).toBe('');
		expect(stateFromSearch(new URLSearchParams())).toEqual(defaultState());
	});

	it('keeps the parts of an edited link that still read', () => {
		const s = stateFromSearch(
			new URLSearchParams('panel=nonsense&plot=c1,zz;c2&from=5&to=2&fx=NoFormula&dock=below')
		);
		expect(s.panel).toBe('channels');
		expect(s.dock).toBe('below');
		expect(s.strips).toEqual([]); // one bad reference spoils the plot list, not the rest
		expect(s.from).toBeUndefined();
		expect(s.to).toBeUndefined();
		expect(s.derived).toEqual([]);
	});

	it('removing a derived channel renumbers the references after it', () => {
		const s = workbenchStateSchema.parse({
			strips: [['d0', 'c3'], ['d1'], ['d2']],
			derived: [
				{ name: 'A', formula: 'x' },
				{ name: 'B', formula: 'y' },
				{ name: 'C', formula: 'z' }
			],
			x: 'd2',
			hist: 'd1'
		});
		const after = withoutDerived(s, 1);
		expect(after.strips).toEqual([['d0', 'c3'], ['d1']]);
		expect(after.derived.map((d) => d.name)).toEqual(['A', 'C']);
		expect(after.x).toBe('d1');
		expect(after.hist).toBeUndefined();
	});
});
