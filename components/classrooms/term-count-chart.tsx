import { formatNumber, niceMax } from "./class-count-chart";

/**
 * The class over the term: each student's 10g + s as a dot per session, the
 * class median joined up, and the network's daily index where it exists.
 */
export function TermCountChart({
  sessions,
}: {
  sessions: Array<{ day: string; raws: number[]; median: number | null; network: number | null }>;
}) {
  if (sessions.length === 0) return null;
  const width = 720;
  const height = 260;
  const left = 40;
  const right = 12;
  const top = 16;
  const bottom = 40;
  const max = niceMax(Math.max(10, ...sessions.flatMap((s) => [...s.raws, s.median ?? 0, s.network ?? 0])));
  const step = (width - left - right) / Math.max(1, sessions.length);
  const x = (i: number) => left + step * (i + 0.5);
  const y = (v: number) => top + (1 - v / max) * (height - top - bottom);
  const path = (values: Array<number | null>) =>
    values
      .map((v, i) => (v === null ? null : `${x(i)},${y(v)}`))
      .reduce<string[]>((parts, point, i, all) => {
        if (point === null) return parts;
        parts.push(`${i === 0 || all[i - 1] === null ? "M" : "L"}${point}`);
        return parts;
      }, [])
      .join(" ");
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((f) => Math.round(f * max));
  const labelEvery = Math.ceil(sessions.length / 8);
  return (
    <figure className="flex flex-col gap-2">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className="h-auto w-full"
        role="img"
        aria-label="The class's counts per session over the term"
      >
        {ticks.map((t) => (
          <g key={t}>
            <line x1={left} x2={width - right} y1={y(t)} y2={y(t)} className="stroke-ink-100" />
            <text x={left - 6} y={y(t) + 3} textAnchor="end" className="fill-ink-500 text-[10px]">
              {t}
            </text>
          </g>
        ))}
        {sessions.map((s, i) => (
          <g key={`${s.day}-${i}`}>
            {s.raws.map((raw, j) => (
              <circle key={j} cx={x(i)} cy={y(raw)} r={3} className="fill-corona-400" opacity={0.7} />
            ))}
            {s.median !== null ? (
              <line
                x1={x(i) - 7}
                x2={x(i) + 7}
                y1={y(s.median)}
                y2={y(s.median)}
                className="stroke-ink-950"
                strokeWidth={2}
              />
            ) : null}
            {i % labelEvery === 0 ? (
              <text
                x={x(i)}
                y={height - bottom + 16}
                textAnchor="middle"
                className="fill-ink-500 text-[10px]"
              >
                {s.day.slice(5)}
              </text>
            ) : null}
          </g>
        ))}
        <path d={path(sessions.map((s) => s.median))} className="fill-none stroke-ink-950" strokeWidth={2} />
        <path
          d={path(sessions.map((s) => s.network))}
          className="fill-none stroke-meadow-700"
          strokeWidth={2}
          strokeDasharray="5 4"
        />
      </svg>
      <figcaption className="flex flex-wrap gap-x-4 text-xs text-ink-600">
        <span>
          <span className="mr-1 inline-block size-2 rounded-full bg-corona-400 align-middle" />a
          student&apos;s 10g + s
        </span>
        <span>
          <span className="mr-1 inline-block h-0.5 w-4 bg-ink-950 align-middle" />
          class median
        </span>
        <span>
          <span className="mr-1 inline-block h-0 w-4 border-t-2 border-dashed border-meadow-700 align-middle" />
          network&apos;s daily index, where there is one
        </span>
        <span className="text-ink-400">Highest value shown: {formatNumber(max)}.</span>
      </figcaption>
    </figure>
  );
}
