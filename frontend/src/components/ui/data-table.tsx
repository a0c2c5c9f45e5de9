import { useState, type ReactNode } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type OnChangeFn,
  type SortingState,
} from '@tanstack/react-table';
import { cn } from '@/lib/cn';
import { Icon } from './icons';

declare module '@tanstack/react-table' {
  // Declaration merging must repeat the library's two type parameters, though this block uses neither.
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData, TValue> {
    /** Right-aligned numbers with tabular figures. */
    numeric?: boolean;
    className?: string;
  }
}

interface DataTableProps<T> {
  caption: string;
  // The column helper gives every column its own value type; a list of them fits only ColumnDef<T, any>.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  columns: ColumnDef<T, any>[];
  data: T[];
  getRowId?: (row: T) => string;
  /** Server mode: sorting is state the caller keeps (in the URL) and sends to the API. */
  sorting?: SortingState;
  onSortingChange?: OnChangeFn<SortingState>;
  /** Client mode: a filter over all columns. */
  globalFilter?: string;
  empty?: ReactNode;
  className?: string;
}

/**
 * A table on @tanstack/react-table. Give `sorting` + `onSortingChange` for a list the server sorts and
 * pages; leave them out for a short list sorted and filtered here.
 */
export function DataTable<T>({ caption, columns, data, getRowId, sorting, onSortingChange, globalFilter, empty, className }: DataTableProps<T>) {
  const manual = sorting !== undefined;
  const [localSorting, setLocalSorting] = useState<SortingState>([]);
  const table = useReactTable({
    data,
    columns,
    getRowId,
    state: { sorting: manual ? sorting : localSorting, globalFilter },
    onSortingChange: manual ? onSortingChange : setLocalSorting,
    manualSorting: manual,
    manualFiltering: manual,
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: manual ? undefined : getSortedRowModel(),
    getFilteredRowModel: manual ? undefined : getFilteredRowModel(),
  });
  const rows = table.getRowModel().rows;
  return (
    <div className={cn('relative w-full overflow-x-auto', className)}>
      <table className="w-full border-collapse text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id} className="border-b border-line-strong">
              {hg.headers.map((header) => {
                const meta = header.column.columnDef.meta;
                const sorted = header.column.getIsSorted();
                const label = header.isPlaceholder ? null : flexRender(header.column.columnDef.header, header.getContext());
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                    className={cn('px-3 py-2 font-bold whitespace-nowrap text-fg-muted', meta?.numeric && 'text-right', meta?.className)}
                  >
                    {header.column.getCanSort() ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className={cn(
                          '-mx-2 inline-flex min-h-11 items-center gap-1 rounded px-2 hover:bg-primary-soft hover:text-fg',
                          meta?.numeric && 'flex-row-reverse',
                        )}
                      >
                        {label}
                        <Icon name={sorted === 'asc' ? 'sortAsc' : sorted === 'desc' ? 'sortDesc' : 'sort'} className={cn('size-4', !sorted && 'opacity-40')} />
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
          {rows.length === 0 ? (
            <tr>
              <td colSpan={columns.length}>{empty ?? <p className="px-3 py-8 text-center text-fg-muted">Nothing to show.</p>}</td>
            </tr>
          ) : (
            rows.map((row) => (
              <tr key={row.id} className="border-b border-line last:border-b-0 hover:bg-surface-sunken">
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  return (
                    <td key={cell.id} className={cn('px-3 py-2.5 align-top', meta?.numeric && 'text-right tabular', meta?.className)}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))
          )}
        </tbody>
      </table>
    </div>
  );
}
