"use client";

import {
  ASSUMED_EYEPIECE_FIELD_DEG,
  type FaceView,
  type SideView,
  type StationKey,
} from "@/lib/optics/diagram";
import { formatLength, type UnitSystem } from "@/lib/optics/units";

const STATION_LABELS: Record<StationKey, string> = {
  hole: "pinhole",
  mirror: "mirror",
  objective: "objective",
  "prime-focus": "prime focus",
  eyepiece: "eyepiece",
  card: "card",
  lens: "lens",
  sensor: "sensor",
};

/** The set-up from the side and the disk face-on, both to scale (see lib/optics/diagram.ts). */
export function SetupDiagram({
  side,
  face,
  unitSystem,
}: {
  side: SideView | null;
  face: FaceView;
  unitSystem: UnitSystem;
}) {
  return (
    <figure className="flex flex-col gap-3" aria-label="Diagram of the set-up, drawn to scale">
      {side ? <SideViewSvg view={side} unitSystem={unitSystem} /> : null}
      <FaceViewSvg view={face} />
      <figcaption className="text-xs text-ink-500">
        {side ? (
          <>
            Side view: distances along the light to scale
            {side.heightExaggeration !== 1
              ? `, heights drawn ${formatExaggeration(side.heightExaggeration)} larger`
              : ""}
            .{" "}
          </>
        ) : null}
        {face.subject === "eyepiece"
          ? `The disk as it fills an eyepiece with a ${ASSUMED_EYEPIECE_FIELD_DEG}° field (assumed), with the smallest spot that shows.`
          : `The disk face-on ${face.subject === "sensor" ? "on the sensor" : "on the card"}, its blur at the edge and the smallest spot that shows${face.apertureDiameterPx !== null ? ", beside the opening that makes it" : ""}, all on one scale.`}
      </figcaption>
    </figure>
  );
}

function formatExaggeration(factor: number): string {
  return factor >= 1
    ? `${Number(factor.toPrecision(3)).toLocaleString("en")} times`
    : `at ${factor.toPrecision(2)} times`;
}

function SideViewSvg({ view, unitSystem }: { view: SideView; unitSystem: UnitSystem }) {
  const { widthPx: w, heightPx: h, axisYPx: axis } = view;
  return (
    <svg
      viewBox={`0 0 ${w} ${h}`}
      className="w-full rounded-md border border-ink-100 bg-paper"
      role="img"
      aria-label="Side view of the set-up"
      data-testid="diagram-side"
    >
      <line x1={0} x2={w} y1={axis} y2={axis} stroke="#b0b1c8" strokeDasharray="4 4" />
      {view.beams.map((beam, i) => (
        <polygon
          key={i}
          points={beam.map((p) => `${p.x},${p.y}`).join(" ")}
          fill="#ffc866"
          fillOpacity={0.45}
          stroke="#f59311"
          strokeWidth={0.75}
        />
      ))}
      {view.stations.map((station, i) => {
        const half = Math.max(station.halfHeightPx, 1.5);
        const isScreen = station.key === "card" || station.key === "sensor";
        const labelBelow = i % 2 === 0;
        return (
          <g key={`${station.key}-${i}`}>
            <line
              x1={station.xPx}
              x2={station.xPx}
              y1={axis - half - (isScreen ? 8 : 3)}
              y2={axis + half + (isScreen ? 8 : 3)}
              stroke={isScreen ? "#232333" : "#75380f"}
              strokeWidth={isScreen ? 3 : 2}
            />
            <text
              x={station.xPx}
              // Kept clear of the distance line at the bottom and of the top edge.
              y={labelBelow ? Math.min(axis + half + 20, h - 46) : Math.max(axis - half - 14, 12)}
              textAnchor={i === 0 ? "start" : i === view.stations.length - 1 ? "end" : "middle"}
              className="fill-ink-700 text-[11px]"
            >
              {STATION_LABELS[station.key]}
            </text>
          </g>
        );
      })}
      {view.stations.slice(1).map((station, i) => {
        const from = view.stations[i]!;
        if (station.xPx - from.xPx < 60) return null;
        const y = h - 34;
        return (
          <g key={`gap-${i}`} className="text-[11px]">
            <line x1={from.xPx} x2={station.xPx} y1={y} y2={y} stroke="#65678e" />
            <line x1={from.xPx} x2={from.xPx} y1={y - 4} y2={y + 4} stroke="#65678e" />
            <line x1={station.xPx} x2={station.xPx} y1={y - 4} y2={y + 4} stroke="#65678e" />
            <text x={(from.xPx + station.xPx) / 2} y={y - 5} textAnchor="middle" className="fill-ink-600">
              {formatLength({ valueMm: station.xMm - from.xMm, unitSystem })}
            </text>
          </g>
        );
      })}
      <ScaleBarSvg
        x={view.stations[0]!.xPx}
        y={h - 10}
        widthPx={view.scaleBar.widthPx}
        label={view.scaleBar.label}
      />
      {view.heightExaggeration !== 1 ? (
        <text x={w - 8} y={14} textAnchor="end" className="fill-ink-500 text-[10px]">
          heights × {Number(view.heightExaggeration.toPrecision(3)).toLocaleString("en")}
        </text>
      ) : null}
      {view.incidence ? <IncidenceInsetSvg inset={view.incidence} /> : <SunRays x={4} y={axis} />}
    </svg>
  );
}

function ScaleBarSvg({ x, y, widthPx, label }: { x: number; y: number; widthPx: number; label: string }) {
  return (
    <g data-testid="scale-bar">
      <rect x={x} y={y - 3} width={widthPx} height={3} fill="#232333" />
      <text x={x + widthPx + 6} y={y} className="fill-ink-700 text-[10px]">
        {label}
      </text>
    </g>
  );
}

function SunRays({ x, y }: { x: number; y: number }) {
  return (
    <g aria-hidden="true">
      {[-10, 0, 10].map((dy) => (
        <line key={dy} x1={x} x2={x + 14} y1={y + dy} y2={y + dy * 0.4} stroke="#d97206" strokeWidth={1.5} />
      ))}
    </g>
  );
}

function IncidenceInsetSvg({ inset }: { inset: NonNullable<SideView["incidence"]> }) {
  const { center: c } = inset;
  return (
    <g aria-label={`Angle of incidence ${Math.round(inset.angleDeg)} degrees`}>
      <circle cx={c.x} cy={c.y} r={inset.radiusPx + 6} fill="white" stroke="#d5d5e2" />
      <line x1={inset.sunFrom.x} y1={inset.sunFrom.y} x2={c.x} y2={c.y} stroke="#d97206" strokeWidth={1.5} />
      <line
        x1={c.x}
        y1={c.y}
        x2={inset.reflectedTo.x}
        y2={inset.reflectedTo.y}
        stroke="#f59311"
        strokeWidth={1.5}
      />
      <line
        x1={c.x}
        y1={c.y}
        x2={inset.normalTo.x}
        y2={inset.normalTo.y}
        stroke="#65678e"
        strokeDasharray="2 2"
      />
      <line
        x1={inset.mirrorEnds[0].x}
        y1={inset.mirrorEnds[0].y}
        x2={inset.mirrorEnds[1].x}
        y2={inset.mirrorEnds[1].y}
        stroke="#232333"
        strokeWidth={3}
      />
      <text x={c.x} y={c.y + inset.radiusPx + 18} textAnchor="middle" className="fill-ink-700 text-[10px]">
        i = {Math.round(inset.angleDeg)}°
      </text>
    </g>
  );
}

function FaceViewSvg({ view }: { view: FaceView }) {
  const { sizePx: s, center: c } = view;
  const spotR = Math.max(view.smallestSpotDiameterPx / 2, 0.75);
  const spotX = c.x + view.diskRadiusXPx * 0.35;
  const spotY = c.y - view.diskRadiusYPx * 0.2;
  const dark = view.subject === "eyepiece";
  return (
    <svg
      viewBox={`0 0 ${s} ${s}`}
      className={`mx-auto w-full max-w-xs rounded-md border border-ink-100 ${dark ? "bg-ink-950" : "bg-white"}`}
      role="img"
      aria-label="The disk face-on, to scale"
      data-testid="diagram-face"
    >
      <defs>
        <clipPath id="field-stop">
          <circle cx={c.x} cy={c.y} r={view.fieldRadiusPx ?? s} />
        </clipPath>
      </defs>
      {view.fieldRadiusPx !== null ? (
        <circle cx={c.x} cy={c.y} r={view.fieldRadiusPx} fill="#17172a" stroke="#505175" />
      ) : null}
      <g clipPath="url(#field-stop)">
        {view.ghostOffsetPx !== null ? (
          <ellipse
            cx={c.x + view.ghostOffsetPx}
            cy={c.y}
            rx={view.diskRadiusXPx}
            ry={view.diskRadiusYPx}
            fill="none"
            stroke="#ffad33"
            strokeOpacity={0.6}
            strokeDasharray="3 3"
          />
        ) : null}
        <ellipse cx={c.x} cy={c.y} rx={view.diskRadiusXPx} ry={view.diskRadiusYPx} fill="#fff1d6" />
        <ellipse
          cx={c.x}
          cy={c.y}
          rx={view.diskRadiusXPx}
          ry={view.diskRadiusYPx}
          fill="none"
          stroke="#f59311"
          strokeOpacity={0.55}
          strokeWidth={Math.max(view.blurWidthPx, 0.75)}
        />
        <circle cx={spotX} cy={spotY} r={spotR} fill="#2b1d3a" />
      </g>
      <text
        x={spotX + spotR + 4}
        y={spotY + 3}
        className={`text-[10px] ${dark ? "fill-ink-100" : "fill-ink-800"}`}
      >
        smallest spot
      </text>
      {view.apertureDiameterPx !== null ? <ApertureMark diameterPx={view.apertureDiameterPx} /> : null}
      {view.scaleBar ? (
        <ScaleBarSvg x={14} y={s - 10} widthPx={view.scaleBar.widthPx} label={view.scaleBar.label} />
      ) : null}
    </svg>
  );
}

/** The hole or mask in the top-left corner, which the disk (72 % of the width, centred) leaves clear. */
function ApertureMark({ diameterPx }: { diameterPx: number }) {
  const r = Math.max(diameterPx / 2, 0.75);
  return (
    <g>
      <text x={14} y={16} className="fill-ink-700 text-[10px]">
        opening
      </text>
      <circle cx={14 + r} cy={24 + r} r={r} fill="#232333" />
    </g>
  );
}
