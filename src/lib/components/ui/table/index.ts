/**
 * The table family: `<Table.Root>` with `Header` (columns as data, or `DataHeader` for a sortable
 * TanStack table), `Body`, `Row`, `Head`, `Cell`, `Caption` and `Empty`; plus the TanStack helper and
 * the keyboard model of editable grids.
 */
export { default as Root } from './Table.svelte';
export { default as Header } from './TableHeader.svelte';
export { default as DataHeader } from './DataTableHeader.svelte';
export { default as Body } from './TableBody.svelte';
export { default as Row } from './TableRow.svelte';
export { default as Head } from './TableHead.svelte';
export { default as Cell } from './TableCell.svelte';
export { default as Caption } from './TableCaption.svelte';
export { default as Empty } from './TableEmpty.svelte';
export {
	ariaSort,
	createDataTable,
	type DataColumn,
	type DataTable,
	type SortDirection
} from './data-table.svelte';
export { gridKeyAction, type GridPosition } from './grid-keys';
export type { ColumnHeading, RowOptions, TableDensity } from './table-context';
export { alike, type Column } from './column';
