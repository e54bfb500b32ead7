'use client';
// A sortable, filterable table over @tanstack/react-table: column headers are buttons (keyboard
// reachable, with aria-sort), and one filter box searches the columns that opt in.
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { useId, useState, type ReactNode } from 'react';
import { SortIcon } from './icons';

export interface DataTableProps<Row> {
  data: Row[];
  columns: ColumnDef<Row, unknown>[];
  /** Caption for screen readers and the filter box's label. */
  caption: string;
  initialSorting?: SortingState;
  filterPlaceholder?: string;
  empty: ReactNode;
  rowId?: (row: Row) => string;
}

export function DataTable<Row>({ data, columns, caption, initialSorting = [], filterPlaceholder, empty, rowId }: DataTableProps<Row>) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [filter, setFilter] = useState('');
  const filterId = useId();
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    globalFilterFn: 'includesString',
    getRowId: rowId ? (row) => rowId(row) : undefined,
  });
  const rows = table.getRowModel().rows;

  return (
    <div>
      {filterPlaceholder && data.length > 0 && (
        <div className="mb-3 flex items-center gap-2">
          <label htmlFor={filterId} className="text-sm text-ink-soft">
            Filter
          </label>
          <input
            id={filterId}
            type="search"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
            placeholder={filterPlaceholder}
            className="w-72 rounded border border-rule bg-white/70 px-2.5 py-1 text-base placeholder:text-ink-faint focus:border-accent"
          />
          {filter && (
            <span className="text-sm text-ink-faint" role="status">
              {rows.length} of {data.length} shown
            </span>
          )}
        </div>
      )}
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-ink/20">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  const label = flexRender(header.column.columnDef.header, header.getContext());
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className="px-2 py-2 text-sm font-semibold tracking-wide text-ink-soft"
                    >
                      {canSort ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex items-center gap-1 rounded hover:text-ink"
                        >
                          {label}
                          <SortIcon sorted={sorted} />
                        </button>
                      ) : (
                        label
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className="border-b border-rule align-top last:border-b-0">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-2 py-2.5">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {data.length === 0 && <div className="py-6 text-ink-faint">{empty}</div>}
      {data.length > 0 && rows.length === 0 && <p className="py-6 text-ink-faint">Nothing matches “{filter}”.</p>}
    </div>
  );
}
