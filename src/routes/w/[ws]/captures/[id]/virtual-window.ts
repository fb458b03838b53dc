/**
 * Windowing for long tables: which rows to render for a scroll position. A million-frame capture
 * at 28 px a row would need a 28-million-pixel scroll area, past what browsers lay out (Firefox
 * stops near 17.9 M px, Chrome near 33.5 M px — from memory), so above MAX_SCROLL_PX the scroll
 * area is compressed and the scroll position maps linearly onto the row index instead.
 */

export const MAX_SCROLL_PX = 8_000_000;

export interface WindowInput {
	scrollTop: number;
	viewportHeight: number;
	rowHeight: number;
	total: number;
	/** Extra rows rendered above and below the viewport, so fast scrolling shows no gaps. */
	overscan?: number;
	maxScrollPx?: number;
}

export interface RowWindow {
	/** First and one-past-last row index to render. */
	start: number;
	end: number;
	/** Height of the scrollable content, in px. */
	scrollHeight: number;
	/** Where the first rendered row sits within the content, in px. */
	offsetTop: number;
}

export function scrollHeightFor(
	total: number,
	rowHeight: number,
	maxScrollPx = MAX_SCROLL_PX
): number {
	return Math.min(total * rowHeight, maxScrollPx);
}

export function rowWindow({
	scrollTop,
	viewportHeight,
	rowHeight,
	total,
	overscan = 8,
	maxScrollPx = MAX_SCROLL_PX
}: WindowInput): RowWindow {
	const scrollHeight = scrollHeightFor(total, rowHeight, maxScrollPx);
	if (total <= 0) return { start: 0, end: 0, scrollHeight: 0, offsetTop: 0 };
	const visibleRows = Math.ceil(viewportHeight / rowHeight) + 1;
	const maxScroll = Math.max(0, scrollHeight - viewportHeight);
	const top = Math.min(Math.max(0, scrollTop), maxScroll);
	// Index of the first visible row: exact when uncompressed, proportional when compressed.
	const lastFirst = Math.max(0, total - Math.floor(viewportHeight / rowHeight));
	const first =
		scrollHeight === total * rowHeight
			? Math.floor(top / rowHeight)
			: maxScroll > 0
				? Math.round((top / maxScroll) * lastFirst)
				: 0;
	const start = Math.max(0, first - overscan);
	const end = Math.min(total, first + visibleRows + overscan);
	// Rows are drawn from the scroll position, so the first visible row lines up with the viewport top.
	const offsetTop =
		scrollHeight === total * rowHeight ? start * rowHeight : top - (first - start) * rowHeight;
	return { start, end, scrollHeight, offsetTop: Math.max(0, offsetTop) };
}

/** scrollTop that brings row `index` to the top of the viewport (the inverse of rowWindow). */
export function scrollTopForRow(
	index: number,
	viewportHeight: number,
	rowHeight: number,
	total: number,
	maxScrollPx = MAX_SCROLL_PX
): number {
	const scrollHeight = scrollHeightFor(total, rowHeight, maxScrollPx);
	const maxScroll = Math.max(0, scrollHeight - viewportHeight);
	if (scrollHeight === total * rowHeight)
		return Math.min(maxScroll, Math.max(0, index * rowHeight));
	const lastFirst = Math.max(1, total - Math.floor(viewportHeight / rowHeight));
	return Math.min(maxScroll, Math.max(0, (index / lastFirst) * maxScroll));
}

/** The page numbers (of `pageSize` rows) that cover rows [start, end). */
export function pagesCovering(start: number, end: number, pageSize: number): number[] {
	if (end <= start) return [];
	const pages: number[] = [];
	for (let p = Math.floor(start / pageSize); p <= Math.floor((end - 1) / pageSize); p++)
		pages.push(p);
	return pages;
}
