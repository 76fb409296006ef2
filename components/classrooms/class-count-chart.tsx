/**
 * The class's counts for one session as horizontal bars of 10g + s, with the
 * class median, the middle half of the class (quartiles) and, when there is
 * one, the network's daily index. Plain SVG: it prints and needs no script.
 */
export function ClassCountChart({
  rows,
  median,
  quartiles,
  networkValue,
}: {
  rows: Array<{ label: string; raw: number; highlight?: boolean }>;
  median: number | null;
  quartiles: { lower: number; upper: number } | null;
  networkValue: number | null;
}) {
  if (rows.length === 0) return null;
  const rowHeight = 26;
  const labelWidth = 120;
  const width = 640;
  const plotWidth = width - labelWidth - 48;
  const top = 24;
  const height = top + rows.length * rowHeight + 28;
  const max = niceMax(Math.max(10, ...rows.map((r) => r.raw), networkValue ?? 0, median ?? 0));
  const x = (v: number) => labelWidth + (v / max) * plotWidth;
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((f) => Math.round(f * max));

  return (
    <figure className="flex flex-col gap-2">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="h-auto w-full"
        role="img"
        aria-label={`Bar chart of each student's 10g + s${median !== null ? `; class median ${formatNumber(median)}` : ""}${networkValue !== null ? `; network ${formatNumber(networkValue)}` : ""}`}
      >
        {quartiles ? (
          <rect
            x={x(quartiles.lower)}
            y={top - 6}
            width={Math.max(1, x(quartiles.upper) - x(quartiles.lower))}
            height={rows.length * rowHeight + 6}
            className="fill-ink-100"
          />
        ) : null}
        {ticks.map((t) => (
          <g key={t}>
            <line
              x1={x(t)}
              x2={x(t)}
              y1={top - 6}
              y2={top + rows.length * rowHeight}
              className="stroke-ink-200"
              strokeWidth={0.5}
            />
            <text x={x(t)} y={height - 10} textAnchor="middle" className="fill-ink-500 text-[10px]">
              {t}
            </text>
          </g>
        ))}
        {rows.map((row, i) => {
          const y = top + i * rowHeight;
          return (
            <g key={`${row.label}-${i}`}>
              <text
                x={labelWidth - 8}
                y={y + rowHeight / 2 + 4}
                textAnchor="end"
                className={`text-[11px] ${row.highlight ? "fill-ink-950 font-semibold" : "fill-ink-700"}`}
              >
                {row.label}
              </text>
              <rect
                x={labelWidth}
                y={y + 4}
                width={Math.max(1, x(row.raw) - labelWidth)}
                height={rowHeight - 10}
                rx={3}
                className={row.highlight ? "fill-corona-600" : "fill-corona-300"}
              />
              <text x={x(row.raw) + 4} y={y + rowHeight / 2 + 4} className="fill-ink-800 text-[10px]">
                {row.raw}
              </text>
            </g>
          );
        })}
        {median !== null ? (
          <g>
            <line
              x1={x(median)}
              x2={x(median)}
              y1={top - 8}
              y2={top + rows.length * rowHeight + 2}
              className="stroke-ink-950"
              strokeWidth={2}
            />
            <text
              x={x(median)}
              y={top - 12}
              textAnchor="middle"
              className="fill-ink-950 text-[10px] font-semibold"
            >
              median {formatNumber(median)}
            </text>
          </g>
        ) : null}
        {networkValue !== null ? (
          <line
            x1={x(networkValue)}
            x2={x(networkValue)}
            y1={top - 8}
            y2={top + rows.length * rowHeight + 2}
            className="stroke-meadow-700"
            strokeWidth={2}
            strokeDasharray="5 4"
          />
        ) : null}
      </svg>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-600">
        <span>
          <span className="mr-1 inline-block h-2 w-4 rounded-sm bg-corona-300 align-middle" />
          10g + s per student
        </span>
        <span>
          <span className="mr-1 inline-block h-3 w-0.5 bg-ink-950 align-middle" />
          class median
        </span>
        {quartiles ? (
          <span>
            <span className="mr-1 inline-block h-2 w-4 bg-ink-100 align-middle" />
            middle half of the class
          </span>
        ) : null}
        {networkValue !== null ? (
          <span>
            <span className="mr-1 inline-block h-0 w-4 border-t-2 border-dashed border-meadow-700 align-middle" />
            network&apos;s daily index (on the network&apos;s k-corrected scale)
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}

export function niceMax(value: number): number {
  const magnitude = 10 ** Math.floor(Math.log10(value));
  for (const step of [1, 2, 2.5, 5, 10]) if (step * magnitude >= value) return step * magnitude;
  return 10 * magnitude;
}

export function formatNumber(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toFixed(1);
}
