import { describe, expect, it } from 'vitest';
import { loadAxisTop, loadPolyline, summarizeLoad } from './bus-load-path';

describe('loadAxisTop', () => {
	it.each([
		[0, 10],
		[3.2, 10],
		[10, 20],
		[34.9, 40],
		[97, 100],
		[100, 100],
		[140, 100]
	])('peak %f %% → axis top %i %%', (peak, top) => {
		expect(loadAxisTop(peak)).toBe(top);
	});
});

describe('summarizeLoad', () => {
	it('gives the mean of the windows and the first window at the peak', () => {
		expect(
			summarizeLoad([
				{ start: 0, percent: 10 },
				{ start: 0.1, percent: 40 },
				{ start: 0.2, percent: 40 },
				{ start: 0.3, percent: 30 }
			])
		).toEqual({
			meanPercent: 30,
			peakPercent: 40,
			peakTime: 0.1
		});
		expect(summarizeLoad([])).toEqual({ meanPercent: 0, peakPercent: 0, peakTime: null });
	});
});

describe('loadPolyline', () => {
	it('maps the first window to the left edge, the last to the right, 0 % to the bottom and the axis top to the top', () => {
		const line = loadPolyline(
			[
				{ start: 5, percent: 0 },
				{ start: 6, percent: 25 },
				{ start: 7, percent: 50 }
			],
			200,
			100,
			50
		);
		expect(line).toBe('0,100 100,50 200,0');
	});
	it('draws loads above the axis top at the top edge', () => {
		expect(
			loadPolyline(
				[
					{ start: 0, percent: 80 },
					{ start: 1, percent: 10 }
				],
				10,
				10,
				20
			)
		).toBe('0,0 10,5');
	});
});
