/**
 * The one way Framewright builds a TanStack table (v9, Svelte 5 runes): sorting by column and a
 * search box over every column, with the rows passed through a getter so rune changes flow in.
 * The header row is `DataTableHeader.svelte`; the body stays with each table (cells are often editors).
 */
import {
	columnFilteringFeature,
	createFilteredRowModel,
	createSortedRowModel,
	createTable,
	filterFn_includesString,
	globalFilteringFeature,
	rowSortingFeature,
	sortFn_alphanumeric,
	sortFn_basic,
	sortFn_text,
	tableFeatures,
	type ColumnDef,
	type RowData,
	type SortingState,
	type Updater
} from '@tanstack/svelte-table';

export const dataTableFeatures = tableFeatures({
	rowSortingFeature,
	sortedRowModel: createSortedRowModel(),
	sortFns: { alphanumeric: sortFn_alphanumeric, text: sortFn_text, basic: sortFn_basic },
	columnFilteringFeature,
	globalFilteringFeature,
	filteredRowModel: createFilteredRowModel(),
	filterFns: { includesString: filterFn_includesString }
});
export type DataTableFeatures = typeof dataTableFeatures;
export type DataColumn<T extends RowData> = ColumnDef<DataTableFeatures, T, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

export interface DataTableOptions<T extends RowData> {
	columns: DataColumn<T>[];
	rows: () => T[];
	rowId: (row: T, index: number) => string;
	/** The search text, owned by the page (a bound input); matched against every searchable column. */
	search: () => string;
	onSearch?: (value: string) => void;
}

export function createDataTable<T extends RowData>(options: DataTableOptions<T>) {
	let sorting = $state<SortingState>([]);
	return createTable({
		features: dataTableFeatures,
		columns: options.columns,
		get data() {
			return options.rows();
		},
		getRowId: options.rowId,
		globalFilterFn: 'includesString',
		state: {
			get sorting() {
				return sorting;
			},
			get globalFilter() {
				return options.search();
			}
		},
		onSortingChange: (next: Updater<SortingState>) => {
			sorting = typeof next === 'function' ? next(sorting) : next;
		},
		onGlobalFilterChange: (next: Updater<string>) => {
			options.onSearch?.(typeof next === 'function' ? next(options.search()) : next);
		}
	});
}

export type DataTable<T extends RowData> = ReturnType<typeof createDataTable<T>>;

export type SortDirection = false | 'asc' | 'desc';

/** The `aria-sort` value of a column header, so screen readers hear the order too. */
export function ariaSort(direction: SortDirection): 'ascending' | 'descending' | 'none' {
	return direction === 'asc' ? 'ascending' : direction === 'desc' ? 'descending' : 'none';
}
