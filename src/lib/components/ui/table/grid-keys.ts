/**
 * Keyboard behaviour of an editable grid, as a pure function so it is the same in every table and
 * testable without a browser: arrows move between cells, Enter (or F2) starts editing, Enter commits,
 * Escape cancels, Tab commits and moves along the row. While editing, arrows belong to the text caret.
 */
export interface GridPosition {
	row: number;
	col: number;
}

export interface GridKeyState {
	at: GridPosition;
	rows: number;
	cols: number;
	editing: boolean;
}

export type GridKeyAction =
	| { kind: 'move'; to: GridPosition }
	| { kind: 'edit' }
	| { kind: 'commit'; then: GridPosition | null }
	| { kind: 'cancel' };

const clamp = (n: number, lo: number, hi: number) => Math.max(lo, Math.min(hi, n));

export function gridKeyAction(
	key: string,
	shift: boolean,
	state: GridKeyState
): GridKeyAction | null {
	const { at, rows, cols, editing } = state;
	if (rows === 0 || cols === 0) return null;
	const to = (row: number, col: number) => ({
		row: clamp(row, 0, rows - 1),
		col: clamp(col, 0, cols - 1)
	});
	const sideways = () => to(at.row, at.col + (shift ? -1 : 1));

	if (editing) {
		if (key === 'Enter') return { kind: 'commit', then: null };
		if (key === 'Escape') return { kind: 'cancel' };
		if (key === 'Tab') return { kind: 'commit', then: sideways() };
		return null;
	}
	switch (key) {
		case 'ArrowUp':
			return { kind: 'move', to: to(at.row - 1, at.col) };
		case 'ArrowDown':
			return { kind: 'move', to: to(at.row + 1, at.col) };
		case 'ArrowLeft':
			return { kind: 'move', to: to(at.row, at.col - 1) };
		case 'ArrowRight':
			return { kind: 'move', to: to(at.row, at.col + 1) };
		case 'Home':
			return { kind: 'move', to: to(at.row, 0) };
		case 'End':
			return { kind: 'move', to: to(at.row, cols - 1) };
		case 'Enter':
		case 'F2':
			return { kind: 'edit' };
		default:
			return null;
	}
}
