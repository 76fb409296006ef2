import { pictureOfTracing } from "@/lib/tracer/tracing-picture";
import type { TracingDocument } from "@/lib/validation/tracing";

/**
 * A saved tracing drawn from its vector form, as a plain SVG (no script):
 * the disk, its sky directions, measured areas (dashed), the spots
 * (penumbra ring, umbra dot) and each group's number. Used where no PNG was saved with the tracing.
 */
export function TracingDrawing({
  document,
  label,
  className,
}: {
  document: TracingDocument;
  label: string;
  className?: string;
}) {
  const picture = pictureOfTracing(document);
  const { viewBox: box, textSize, lineWidth } = picture;
  return (
    <svg
      viewBox={`${box.x} ${box.y} ${box.width} ${box.height}`}
      role="img"
      aria-label={label}
      className={className}
      data-testid="tracing-drawing"
    >
      <rect x={box.x} y={box.y} width={box.width} height={box.height} className="fill-paper" />
      {picture.disk ? (
        <circle
          cx={picture.disk.cx}
          cy={picture.disk.cy}
          r={picture.disk.r}
          className="fill-white stroke-ink-400"
          strokeWidth={lineWidth}
        />
      ) : null}
      {picture.compass.map((mark) => (
        <text
          key={mark.label}
          x={mark.x}
          y={mark.y}
          fontSize={textSize}
          textAnchor="middle"
          dominantBaseline="central"
          className={mark.label === "N" ? "fill-ink-900 font-semibold" : "fill-ink-500"}
        >
          {mark.label}
        </text>
      ))}
      {picture.areas.map((area, index) => (
        <ellipse
          key={index}
          cx={area.cx}
          cy={area.cy}
          rx={area.rx}
          ry={area.ry}
          transform={`rotate(${area.rotationDeg} ${area.cx} ${area.cy})`}
          fill="none"
          className={area.of === "group" ? "stroke-corona-600" : "stroke-ink-500"}
          strokeWidth={lineWidth * 0.6}
          strokeDasharray={`${lineWidth * 2} ${lineWidth * 1.5}`}
        />
      ))}
      {picture.spots.map((spot, index) => (
        <g key={index}>
          {spot.penumbra !== null ? (
            <circle
              cx={spot.x}
              cy={spot.y}
              r={spot.penumbra}
              className="fill-ink-200 stroke-ink-500"
              strokeWidth={lineWidth * 0.5}
            />
          ) : null}
          <circle
            cx={spot.x}
            cy={spot.y}
            r={spot.umbra}
            className={spot.grouped ? "fill-ink-950" : "fill-caution-700"}
          />
        </g>
      ))}
      {picture.groupLabels.map((group) => (
        <text
          key={group.number}
          x={group.x}
          y={group.y}
          fontSize={textSize}
          textAnchor="middle"
          className="fill-corona-700 font-semibold"
        >
          {group.number}
        </text>
      ))}
    </svg>
  );
}
