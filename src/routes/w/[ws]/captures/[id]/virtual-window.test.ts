import { describe, expect, it } from 'vitest';
import { pagesCovering, rowWindow, scrollHeightFor, scrollTopForRow } from './virtual-window';

const rowHeight = 28;
const viewportHeight = 280; // ten rows

describe('rowWindow, uncompressed', () => {
	it('renders the visible rows plus overscan, placed where they would be in the full list', () => {
		const w = rowWindow({
			scrollTop: 28 * 100,
			viewportHeight,
			rowHeight,
			total: 1000,
			overscan: 5
		});
		expect(w.start).toBe(95);
		expect(w.end).toBe(100 + 11 + 5);
		expect(w.offsetTop).toBe(95 * rowHeight);
		expect(w.scrollHeight).toBe(1000 * rowHeight);
	});

	it('never renders past the last row, and renders nothing for an empty table', () => {
		const w = rowWindow({ scrollTop: 1e9, viewportHeight, rowHeight, total: 50 });
		expect(w.end).toBe(50);
		expect(rowWindow({ scrollTop: 0, viewportHeight, rowHeight, total: 0 })).toEqual({
			start: 0,
			end: 0,
			scrollHeight: 0,
			offsetTop: 0
		});
	});
});

describe('rowWindow, compressed for a million rows', () => {
	const total = 1_000_000;
	const maxScrollPx = 1_000_000;

	it('caps the scroll height and still reaches the first and the last row', () => {
		expect(scrollHeightFor(total, rowHeight, maxScrollPx)).toBe(maxScrollPx);
		const top = rowWindow({
			scrollTop: 0,
			viewportHeight,
			rowHeight,
			total,
			overscan: 0,
			maxScrollPx
		});
		expect(top.start).toBe(0);
		const bottom = rowWindow({
			scrollTop: maxScrollPx,
			viewportHeight,
			rowHeight,
			total,
			overscan: 0,
			maxScrollPx
		});
		expect(bottom.end).toBe(total);
		// The last rows end exactly at the bottom of the scroll area, so nothing hangs below it.
		expect(bottom.offsetTop + (bottom.end - bottom.start) * rowHeight).toBeLessThanOrEqual(
			maxScrollPx
		);
	});

	it.each([0, 1, 12_345, 500_000, 999_990])(
		'scrollTopForRow(%i) brings that row to the top (inverse of rowWindow)',
		(index) => {
			const scrollTop = scrollTopForRow(index, viewportHeight, rowHeight, total, maxScrollPx);
			const w = rowWindow({
				scrollTop,
				viewportHeight,
				rowHeight,
				total,
				overscan: 0,
				maxScrollPx
			});
			expect(Math.abs(w.start - index)).toBeLessThanOrEqual(1);
			// and the rendered first row sits at the viewport top
			expect(Math.abs(w.offsetTop - scrollTop)).toBeLessThanOrEqual(rowHeight);
		}
	);
});

describe('pagesCovering', () => {
	it('lists every page that holds a rendered row', () => {
		expect(pagesCovering(95, 116, 50)).toEqual([1, 2]);
		expect(pagesCovering(0, 50, 50)).toEqual([0]);
		expect(pagesCovering(10, 10, 50)).toEqual([]);
	});
});
