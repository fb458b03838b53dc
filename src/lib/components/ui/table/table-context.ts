import { getContext, setContext } from 'svelte';

/**
 * How tightly a table is set: `roomy` for page-level lists, `normal` for most data tables, `compact`
 * for editors and dense figures, `flush` for a table set in running text (no left padding, no frame).
 */
export type TableDensity = 'roomy' | 'normal' | 'compact' | 'flush';

export const CELL_PADDING: Record<TableDensity, string> = {
	roomy: 'px-4 py-2',
	normal: 'px-3 py-1.5',
	compact: 'px-2 py-1',
	flush: 'py-1 pr-3'
};

export interface TableContext {
	readonly density: TableDensity;
	/** Drawn on a card or inside a border: the header row gets the sunken band. */
	readonly framed: boolean;
}

const KEY = Symbol('fw-table');

export function setTableContext(context: TableContext): void {
	setContext(KEY, context);
}

/** Cells outside a Table.Root (none today) fall back to the normal density. */
export function tableContext(): TableContext {
	return getContext<TableContext | undefined>(KEY) ?? { density: 'normal', framed: true };
}

export type CellAlign = 'left' | 'right' | 'center';

export const ALIGN: Record<CellAlign, string> = {
	left: 'text-left',
	right: 'text-right',
	center: 'text-center'
};

/** A column heading given as data: a label, or a label with its alignment. */
export type ColumnHeading =
	string | { label: string; align?: CellAlign; srOnly?: boolean; class?: string };

/** Options of a row drawn from data: its tone and any attributes (`data-*`, ARIA). */
export type RowOptions = { tone?: 'accent' | 'caution' | 'danger' | null } & Record<
	string,
	unknown
>;
