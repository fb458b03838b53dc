import { describe, expect, it } from 'vitest';
import { gridKeyAction, type GridKeyState } from './grid-keys';

const browsing: GridKeyState = { at: { row: 1, col: 1 }, rows: 3, cols: 4, editing: false };
const editing: GridKeyState = { ...browsing, editing: true };

describe('gridKeyAction', () => {
	it.each([
		['ArrowUp', { row: 0, col: 1 }],
		['ArrowDown', { row: 2, col: 1 }],
		['ArrowLeft', { row: 1, col: 0 }],
		['ArrowRight', { row: 1, col: 2 }],
		['Home', { row: 1, col: 0 }],
		['End', { row: 1, col: 3 }]
	])('%s moves the active cell', (key, to) => {
		expect(gridKeyAction(key, false, browsing)).toEqual({ kind: 'move', to });
	});

	it('stops at the edges instead of wrapping', () => {
		const corner: GridKeyState = { ...browsing, at: { row: 0, col: 0 } };
		expect(gridKeyAction('ArrowUp', false, corner)).toEqual({
			kind: 'move',
			to: { row: 0, col: 0 }
		});
		expect(gridKeyAction('ArrowLeft', false, corner)).toEqual({
			kind: 'move',
			to: { row: 0, col: 0 }
		});
		const last: GridKeyState = { ...browsing, at: { row: 2, col: 3 } };
		expect(gridKeyAction('ArrowDown', false, last)).toEqual({
			kind: 'move',
			to: { row: 2, col: 3 }
		});
	});

	it('starts editing with Enter or F2, and ignores other keys', () => {
		expect(gridKeyAction('Enter', false, browsing)).toEqual({ kind: 'edit' });
		expect(gridKeyAction('F2', false, browsing)).toEqual({ kind: 'edit' });
		expect(gridKeyAction('a', false, browsing)).toBeNull();
	});

	it('commits with Enter, cancels with Escape, and leaves arrows to the text caret while editing', () => {
		expect(gridKeyAction('Enter', false, editing)).toEqual({ kind: 'commit', then: null });
		expect(gridKeyAction('Escape', false, editing)).toEqual({ kind: 'cancel' });
		expect(gridKeyAction('ArrowLeft', false, editing)).toBeNull();
	});

	it('commits with Tab and moves right, or left with Shift', () => {
		expect(gridKeyAction('Tab', false, editing)).toEqual({
			kind: 'commit',
			then: { row: 1, col: 2 }
		});
		expect(gridKeyAction('Tab', true, editing)).toEqual({
			kind: 'commit',
			then: { row: 1, col: 0 }
		});
	});

	it('does nothing in an empty grid', () => {
		expect(gridKeyAction('ArrowDown', false, { ...browsing, rows: 0 })).toBeNull();
	});
});
