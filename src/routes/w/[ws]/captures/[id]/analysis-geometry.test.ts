import { describe, expect, it } from 'vitest';
import { histogramBars, scatterPath } from './analysis-geometry';

describe('scatterPath', () => {
	it('puts the smallest pair at the bottom left and the largest at the top right', () => {
		const { path, x, y } = scatterPath([0, 10, 5], [100, 300, 200], 100, 50);
		expect(x).toEqual({ min: 0, max: 10 });
		expect(y).toEqual({ min: 100, max: 300 });
		// Squares centred on (0, 50), (100, 0) and (50, 25).
		expect(path).toBe('M-1.0 49.0h2v2h-2zM99.0 -1.0h2v2h-2zM49.0 24.0h2v2h-2z');
	});

	it('draws a constant in the middle', () => {
		expect(scatterPath([3, 3], [7, 7], 10, 10).path).toBe('M4.0 4.0h2v2h-2zM4.0 4.0h2v2h-2z');
	});
});

describe('histogramBars', () => {
	it('scales bars to the fullest bin and lays them side by side', () => {
		expect(histogramBars([1, 4, 2], 30, 40)).toEqual([
			{ x: 0, y: 30, width: 10, height: 10 },
			{ x: 10, y: 0, width: 10, height: 40 },
			{ x: 20, y: 20, width: 10, height: 20 }
		]);
	});
});
