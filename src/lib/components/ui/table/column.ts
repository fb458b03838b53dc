import type { Snippet } from 'svelte';
import type { CellAlign } from './table-context';

/**
 * One column of a table drawn from data (`<Table.Root columns rows>`): its heading, how its cells
 * look, and what they hold — plain text from `value`, or a snippet for links, buttons and fields.
 */
export interface Column<T> {
	header: string;
	/** A heading only screen readers read (a column of buttons). */
	srOnly?: boolean;
	align?: CellAlign;
	mono?: boolean;
	numeric?: boolean;
	nowrap?: boolean;
	/** The row's heading cell (`<th scope="row">`). */
	rowHeader?: boolean;
	class?: string;
	/** Names the column for a `cell` snippet that serves several (which field it edits). */
	id?: string;
	value?: (row: T, index: number) => string | number | null | undefined;
	cell?: Snippet<[T, number, Column<T>]>;
}

/** Columns that share a look, e.g. `alike({ mono: true, align: 'right' }, { header: 'Min', … })`. */
export function alike<T>(common: Partial<Column<T>>, ...columns: Column<T>[]): Column<T>[] {
	return columns.map((c) => ({ ...common, ...c }));
}
