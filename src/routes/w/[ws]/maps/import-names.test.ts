import { describe, expect, it } from 'vitest';
import { copyName, sameName } from './import-names';

describe('import names', () => {
	it('treats names that differ only in case or spaces as the same', () => {
		expect(sameName('Engine map', ' engine MAP ')).toBe(true);
		expect(sameName('Engine map', 'Engine map 2')).toBe(false);
	});

	it('finds the first free copy name', () => {
		expect(copyName('Engine', ['Engine'])).toBe('Engine (copy)');
		expect(copyName('Engine', ['Engine', 'engine (copy)', 'Engine (copy 2)'])).toBe(
			'Engine (copy 3)'
		);
	});
});
