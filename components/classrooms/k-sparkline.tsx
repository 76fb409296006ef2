/**
 * A student's running k after each session, with a band of ±10 % around the
 * term's k: the line settles into the band as the student gains experience.
 */
export function KSparkline({
  steps,
  finalK,
  tolerance = 0.1,
}: {
  steps: Array<number | null>;
  finalK: number | null;
  tolerance?: number;
}) {
  const values = steps.filter((v): v is number => v !== null);
  if (values.length < 2 || finalK === null) return <span className="text-xs text-ink-400">—</span>;
  const width = 140;
  const height = 36;
  const lo = Math.min(...values, finalK * (1 - tolerance));
  const hi = Math.max(...values, finalK * (1 + tolerance));
  const x = (i: number) => 4 + (i / Math.max(1, steps.length - 1)) * (width - 8);
  const y = (v: number) => 4 + (1 - (v - lo) / (hi - lo || 1)) * (height - 8);
  const d = steps
    .map((v, i) => (v === null ? null : `${x(i)},${y(v)}`))
    .filter(Boolean)
    .map((p, i) => `${i === 0 ? "M" : "L"}${p}`)
    .join(" ");
  return (
    <svg
      viewBox={`0 0 ${width} ${height}`}
      className="h-9 w-36"
      role="img"
      aria-label={`Running k over ${steps.length} sessions`}
    >
      <rect
        x={0}
        y={y(finalK * (1 + tolerance))}
        width={width}
        height={Math.max(1, y(finalK * (1 - tolerance)) - y(finalK * (1 + tolerance)))}
        className="fill-meadow-50"
      />
      <line x1={0} x2={width} y1={y(finalK)} y2={y(finalK)} className="stroke-meadow-200" />
      <path d={d} className="fill-none stroke-corona-700" strokeWidth={1.5} />
    </svg>
  );
}
