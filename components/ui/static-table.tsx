import type { ReactNode } from "react";

/**
 * One column of a StaticTable: its header, its alignment, how a row fills
 * its cell, and any classes its cells need beyond the table's own.
 */
export type StaticColumn<Row> = {
  key: string;
  header: ReactNode;
  /** Numbers read best right-aligned, so their digits line up. */
  align?: "left" | "right";
  /** Extra classes for this column's body cells (weight, colour, wrapping). */
  className?: string;
  cell: (row: Row, index: number) => ReactNode;
};

/**
 * "sheet": a table of its own, framed, with a banded upper-case header (the
 * Archive's report, the Observers page, the API reference).
 * "plain": a table inside a card, with a ruled header (classroom views).
 */
export type StaticTableLook = "sheet" | "plain";

const LOOKS = {
  sheet: {
    frame:
      "overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm print:overflow-visible print:shadow-none",
    table: "min-w-full text-sm",
    head: "bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase",
    th: "px-3 font-semibold",
    td: "px-3",
    row: "border-t border-ink-100",
    body: "tabular-nums",
    empty: "rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600",
  },
  plain: {
    frame: "overflow-x-auto print:overflow-visible",
    table: "w-full text-left text-sm",
    head: "border-b border-ink-200 text-xs text-ink-500",
    th: "pr-3 font-medium last:pr-0",
    td: "pr-3 last:pr-0",
    row: "",
    body: "divide-y divide-ink-100 tabular-nums",
    empty: "text-sm text-ink-600",
  },
} as const;

const DENSITY = {
  comfortable: { th: "py-2", td: "py-2" },
  compact: { th: "py-1.5", td: "py-1" },
} as const;

/**
 * A read-only table rendered on the server (no sorting or paging: use
 * DataTable for that). It names itself with a caption, shows `empty` instead
 * of a headless table when there are no rows, keeps rows whole across printed
 * pages and repeats the header on each.
 */
export function StaticTable<Row>({
  caption,
  showCaption = false,
  columns,
  rows,
  rowKey,
  rowClassName,
  empty,
  footer,
  look = "sheet",
  density = "comfortable",
  className = "",
  testId,
}: {
  /** Names the table for screen readers (and tests); shown only with showCaption. */
  caption: ReactNode;
  showCaption?: boolean;
  columns: ReadonlyArray<StaticColumn<Row>>;
  rows: readonly Row[];
  rowKey: (row: Row, index: number) => string;
  rowClassName?: (row: Row, index: number) => string | undefined;
  /** What to say (and what to do next) when there are no rows. */
  empty?: ReactNode;
  /** Summary rows (<tr> elements) under the body, e.g. a class median. */
  footer?: ReactNode;
  look?: StaticTableLook;
  density?: keyof typeof DENSITY;
  /** Classes for the outer element (spacing around the table). */
  className?: string;
  testId?: string;
}) {
  const style = LOOKS[look];
  const space = DENSITY[density];
  if (rows.length === 0 && empty !== undefined) {
    return <div className={`${style.empty} ${className}`}>{empty}</div>;
  }
  const alignOf = (column: StaticColumn<Row>) => (column.align === "right" ? "text-right" : "text-left");
  return (
    <div className={`${style.frame} ${className}`}>
      <table className={style.table} data-testid={testId}>
        <caption className={showCaption ? "mb-2 text-left text-sm text-ink-600" : "sr-only"}>
          {caption}
        </caption>
        {/* Browsers repeat a <thead> at the top of every printed page. */}
        <thead className={style.head}>
          <tr>
            {columns.map((column) => (
              <th key={column.key} scope="col" className={`${style.th} ${space.th} ${alignOf(column)}`}>
                {column.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className={style.body}>
          {rows.map((row, index) => (
            <tr
              key={rowKey(row, index)}
              className={`break-inside-avoid ${style.row} ${rowClassName?.(row, index) ?? ""}`}
            >
              {columns.map((column) => (
                <td
                  key={column.key}
                  className={`${style.td} ${space.td} ${alignOf(column)} ${column.className ?? ""}`}
                >
                  {column.cell(row, index)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
        {footer ? <tfoot className="border-t border-ink-200 text-ink-700">{footer}</tfoot> : null}
      </table>
    </div>
  );
}
