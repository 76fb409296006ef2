"use client";

import {
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type ColumnDef,
  type PaginationState,
  type RowData,
  type SortingState,
} from "@tanstack/react-table";

export const serverTableFeatures = tableFeatures({ rowPaginationFeature, rowSortingFeature });
export type ServerTableFeatures = typeof serverTableFeatures;
// Columns of one table hold values of different types; `any` here is the
// library's own convention for a heterogeneous column list.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type ServerColumn<Row extends RowData> = ColumnDef<ServerTableFeatures, Row, any>;

/**
 * A table whose paging and sorting happen on the server: the table holds the
 * state, the caller fetches the page that state describes.
 */
export function DataTable<Row extends RowData>({
  columns,
  rows,
  rowCount,
  pagination,
  onPaginationChange,
  sorting,
  onSortingChange,
  loading,
  empty,
  caption,
}: {
  columns: ServerColumn<Row>[];
  rows: Row[];
  rowCount: number;
  pagination: PaginationState;
  onPaginationChange: (next: PaginationState) => void;
  sorting: SortingState;
  onSortingChange: (next: SortingState) => void;
  loading: boolean;
  empty: React.ReactNode;
  caption: string;
}) {
  const table = useTable({
    features: serverTableFeatures,
    columns,
    data: rows,
    rowCount,
    manualPagination: true,
    manualSorting: true,
    state: { pagination, sorting },
    onPaginationChange: (updater) =>
      onPaginationChange(typeof updater === "function" ? updater(pagination) : updater),
    onSortingChange: (updater) => onSortingChange(typeof updater === "function" ? updater(sorting) : updater),
  });
  const pageCount = Math.max(1, Math.ceil(rowCount / pagination.pageSize));

  return (
    <div className="overflow-hidden rounded-lg border border-ink-100 bg-white shadow-sm">
      <div className="overflow-x-auto">
        <table className="min-w-full text-sm" aria-busy={loading}>
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sortable = header.column.getCanSort();
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="px-3 py-2 font-semibold"
                      aria-sort={
                        sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined
                      }
                    >
                      {sortable ? (
                        <button
                          type="button"
                          className="inline-flex items-center gap-1 uppercase hover:text-ink-900"
                          onClick={header.column.getToggleSortingHandler()}
                        >
                          <table.FlexRender header={header} />
                          <span aria-hidden="true">
                            {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                          </span>
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className={loading ? "opacity-50" : ""}>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-ink-100 hover:bg-corona-50">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 whitespace-nowrap tabular-nums">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {rows.length === 0 && !loading ? (
        <div className="px-4 py-10 text-center text-sm text-ink-600">{empty}</div>
      ) : null}
      {loading && rows.length === 0 ? (
        <div className="px-4 py-10 text-center text-sm text-ink-500" role="status">
          Loading…
        </div>
      ) : null}
      <div className="flex items-center justify-between border-t border-ink-100 px-3 py-2 text-sm text-ink-600">
        <span>
          {rowCount} {rowCount === 1 ? "entry" : "entries"} · page {pagination.pageIndex + 1} of {pageCount}
        </span>
        <div className="flex gap-2">
          <button
            type="button"
            className="rounded border border-ink-200 px-3 py-1 disabled:opacity-40"
            onClick={() => table.previousPage()}
            disabled={!table.getCanPreviousPage()}
          >
            Previous
          </button>
          <button
            type="button"
            className="rounded border border-ink-200 px-3 py-1 disabled:opacity-40"
            onClick={() => table.nextPage()}
            disabled={!table.getCanNextPage()}
          >
            Next
          </button>
        </div>
      </div>
    </div>
  );
}
