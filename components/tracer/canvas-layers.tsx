"use client";

import Konva from "konva";
import { memo, useEffect, useRef, useState } from "react";
import {
  Arrow,
  Circle,
  Ellipse,
  Group,
  Image as KonvaImage,
  Layer,
  Line,
  Rect,
  Shape,
  Text,
} from "react-konva";

import type { PlacedGrid } from "@/lib/tracer/grid-placement";
import type { PlanePoint, SkyFrame } from "@/lib/tracer/orientation";
import type { TracingDocument, TracingSpot } from "@/lib/validation/tracing";

/** Heliotally's tracer palette (our own; see tailwind.config.ts). */
export const TRACER_COLOURS = {
  card: "#fcfbf7",
  disk: "#fff8e8",
  limb: "#17172a",
  grid: "#8587a9",
  equator: "#b35309",
  umbra: "#2b1d3a",
  penumbra: "#65678e",
  selected: "#f59311",
  outside: "#a3290f",
  overlay: "#d97206",
  area: "#1c6e3d",
  label: "#42435f",
};

function strokePolylines(polylines: number[][]) {
  return (context: Konva.Context, shape: Konva.Shape) => {
    context.beginPath();
    for (const line of polylines) {
      if (line.length < 4) continue;
      context.moveTo(line[0]!, line[1]!);
      for (let i = 2; i < line.length; i += 2) context.lineTo(line[i]!, line[i + 1]!);
    }
    context.strokeShape(shape);
  };
}

/** The photo's box inside the drawing: as large as fits, centred, never stretched. */
function fitInside({ width, height, image }: { width: number; height: number; image: HTMLImageElement }) {
  const scale = Math.min(width / image.naturalWidth, height / image.naturalHeight);
  const w = image.naturalWidth * scale;
  const h = image.naturalHeight * scale;
  return { x: (width - w) / 2, y: (height - h) / 2, width: w, height: h };
}

/** The card, and the photo to trace over when there is one (filters need a cached node). */
export const BackgroundLayer = memo(function BackgroundLayer({
  width,
  height,
  imageUrl,
  brightness,
  contrast,
}: {
  width: number;
  height: number;
  imageUrl: string | null;
  brightness: number;
  contrast: number;
}) {
  const [image, setImage] = useState<HTMLImageElement | null>(null);
  const imageRef = useRef<Konva.Image>(null);
  useEffect(() => {
    if (!imageUrl) return;
    const element = new window.Image();
    // Without CORS the rendered PNG could not be exported from a tainted canvas.
    element.crossOrigin = "anonymous";
    element.onload = () => setImage(element);
    element.src = imageUrl;
    return () => {
      element.onload = null;
      setImage(null);
    };
  }, [imageUrl]);
  useEffect(() => {
    const node = imageRef.current;
    if (!node || !image) return;
    node.cache();
    node.getLayer()?.batchDraw();
  }, [image, brightness, contrast]);
  return (
    <Layer listening={false}>
      <Rect x={0} y={0} width={width} height={height} fill={TRACER_COLOURS.card} />
      {image ? (
        <KonvaImage
          ref={imageRef}
          image={image}
          {...fitInside({ width, height, image })}
          filters={[Konva.Filters.Brightness, Konva.Filters.Contrast]}
          brightness={brightness}
          contrast={contrast}
        />
      ) : null}
    </Layer>
  );
});

/** The fitted disk, its orientation letters and the heliographic grid. */
export const DiskGridLayer = memo(function DiskGridLayer({
  disk,
  frame,
  grid,
  showGrid,
  hasImage,
  screenScale,
}: {
  disk: TracingDocument["disk"];
  frame: SkyFrame | null;
  grid: PlacedGrid | null;
  showGrid: boolean;
  hasImage: boolean;
  /** Screen pixels per document unit, to keep letters the same size at any zoom. */
  screenScale: number;
}) {
  const fontSize = 15 / screenScale;
  const letters =
    disk && frame
      ? ([
          ["N", frame.north],
          ["S", { x: -frame.north.x, y: -frame.north.y }],
          ["W", frame.west],
          ["E", { x: -frame.west.x, y: -frame.west.y }],
        ] as const)
      : [];
  return (
    <Layer listening={false}>
      {disk ? (
        <Circle
          x={disk.cx}
          y={disk.cy}
          radius={disk.r}
          fill={hasImage ? undefined : TRACER_COLOURS.disk}
          stroke={TRACER_COLOURS.limb}
          strokeWidth={1.5}
          strokeScaleEnabled={false}
        />
      ) : null}
      {grid && showGrid ? (
        <>
          <Shape
            sceneFunc={strokePolylines(grid.lines)}
            stroke={TRACER_COLOURS.grid}
            strokeWidth={0.75}
            strokeScaleEnabled={false}
          />
          <Shape
            sceneFunc={strokePolylines([...grid.equator, ...grid.centralMeridian])}
            stroke={TRACER_COLOURS.equator}
            strokeWidth={1.25}
            strokeScaleEnabled={false}
          />
          {[grid.northPole, grid.southPole].map((pole, i) =>
            pole ? (
              <Group key={i} x={pole.x} y={pole.y}>
                <Circle radius={3 / screenScale} fill={TRACER_COLOURS.equator} />
                <Text
                  text={i === 0 ? "N pole" : "S pole"}
                  x={5 / screenScale}
                  y={-6 / screenScale}
                  fontSize={11 / screenScale}
                  fill={TRACER_COLOURS.equator}
                />
              </Group>
            ) : null,
          )}
        </>
      ) : null}
      {disk
        ? letters.map(([letter, direction]) => (
            <Text
              key={letter}
              text={letter}
              x={disk.cx + direction.x * (disk.r + 16 / screenScale) - fontSize * 0.3}
              y={disk.cy + direction.y * (disk.r + 16 / screenScale) - fontSize * 0.5}
              fontSize={fontSize}
              fontStyle="bold"
              fill={TRACER_COLOURS.limb}
            />
          ))
        : null}
    </Layer>
  );
});

const SpotNode = memo(function SpotNode({
  spot,
  selected,
  outside,
  registerNode,
}: {
  spot: TracingSpot;
  selected: boolean;
  outside: boolean;
  registerNode: (id: string, node: Konva.Group | null) => void;
}) {
  const outer = spot.penumbraRadius ?? spot.umbraRadius;
  return (
    <Group x={spot.x} y={spot.y} ref={(node) => registerNode(spot.id, node)}>
      {spot.penumbraRadius !== null ? (
        <Circle
          radius={spot.penumbraRadius}
          fill={TRACER_COLOURS.penumbra}
          opacity={0.45}
          perfectDrawEnabled={false}
        />
      ) : null}
      <Circle
        radius={spot.umbraRadius}
        fill={outside ? TRACER_COLOURS.outside : TRACER_COLOURS.umbra}
        perfectDrawEnabled={false}
      />
      {selected ? (
        <Circle
          name="selection-ring"
          radius={outer + 3}
          stroke={TRACER_COLOURS.selected}
          strokeWidth={2}
          strokeScaleEnabled={false}
          perfectDrawEnabled={false}
        />
      ) : null}
      {spot.area ? (
        <Ellipse
          x={spot.area.cx - spot.x}
          y={spot.area.cy - spot.y}
          radiusX={spot.area.rx}
          radiusY={spot.area.ry}
          rotation={spot.area.rotationDeg}
          stroke={TRACER_COLOURS.area}
          strokeWidth={1}
          dash={[4, 3]}
          strokeScaleEnabled={false}
          perfectDrawEnabled={false}
        />
      ) : null}
    </Group>
  );
});

/** Spots, group areas and group numbers. Redrawn alone while a spot is dragged. */
export const SpotsLayer = memo(function SpotsLayer({
  document,
  groupLabels,
  selectedIds,
  outsideIds,
  highlightedGroupId,
  screenScale,
  registerNode,
  layerRef,
}: {
  document: TracingDocument;
  groupLabels: Array<{ id: string; number: number; x: number; y: number }>;
  selectedIds: ReadonlySet<string>;
  outsideIds: ReadonlySet<string>;
  highlightedGroupId: string | null;
  screenScale: number;
  registerNode: (id: string, node: Konva.Group | null) => void;
  layerRef: React.Ref<Konva.Layer>;
}) {
  return (
    <Layer listening={false} ref={layerRef}>
      {document.groups.map((group) =>
        group.area ? (
          <Ellipse
            key={`area-${group.id}`}
            x={group.area.cx}
            y={group.area.cy}
            radiusX={group.area.rx}
            radiusY={group.area.ry}
            rotation={group.area.rotationDeg}
            stroke={TRACER_COLOURS.area}
            strokeWidth={group.id === highlightedGroupId ? 2 : 1}
            dash={[6, 4]}
            strokeScaleEnabled={false}
          />
        ) : null,
      )}
      {document.spots.map((spot) => (
        <SpotNode
          key={spot.id}
          spot={spot}
          selected={selectedIds.has(spot.id)}
          outside={outsideIds.has(spot.id)}
          registerNode={registerNode}
        />
      ))}
      {groupLabels.map((label) => (
        <Text
          key={label.id}
          text={String(label.number)}
          x={label.x}
          y={label.y}
          fontSize={14 / screenScale}
          fontStyle="bold"
          fill={label.id === highlightedGroupId ? TRACER_COLOURS.selected : TRACER_COLOURS.label}
        />
      ))}
    </Layer>
  );
});

export type Draft =
  | { kind: "disk"; cx: number; cy: number; r: number }
  | { kind: "drift"; from: PlanePoint; to: PlanePoint }
  | { kind: "lasso"; points: PlanePoint[] }
  | { kind: "box"; from: PlanePoint; to: PlanePoint }
  | { kind: "penumbra"; at: PlanePoint; r: number };

/** Work in progress: limb points, the orientation marks, drafts, suggestions. Never exported to the PNG. */
export const OverlayLayer = memo(function OverlayLayer({
  draft,
  limbPoints,
  orientation,
  disk,
  suggestion,
  screenScale,
  layerRef,
}: {
  draft: Draft | null;
  limbPoints: PlanePoint[];
  orientation: TracingDocument["orientation"];
  disk: TracingDocument["disk"];
  suggestion: Array<{ cx: number; cy: number; r: number; label: string }> | null;
  screenScale: number;
  layerRef: React.Ref<Konva.Layer>;
}) {
  const px = (n: number) => n / screenScale;
  return (
    <Layer listening={false} ref={layerRef}>
      {orientation?.mode === "north" && disk ? (
        <Group>
          <Line
            points={[disk.cx, disk.cy, orientation.point.x, orientation.point.y]}
            stroke={TRACER_COLOURS.overlay}
            strokeWidth={1}
            dash={[6, 4]}
            strokeScaleEnabled={false}
          />
          <Circle
            x={orientation.point.x}
            y={orientation.point.y}
            radius={px(5)}
            fill={TRACER_COLOURS.overlay}
          />
        </Group>
      ) : null}
      {orientation?.mode === "drift" ? (
        <Group>
          <Arrow
            points={[orientation.from.x, orientation.from.y, orientation.to.x, orientation.to.y]}
            stroke={TRACER_COLOURS.overlay}
            fill={TRACER_COLOURS.overlay}
            strokeWidth={2}
            pointerLength={px(12)}
            pointerWidth={px(10)}
            dash={[10, 4]}
            strokeScaleEnabled={false}
          />
          <Text
            text="drift → W"
            x={orientation.to.x + px(6)}
            y={orientation.to.y - px(16)}
            fontSize={px(12)}
            fill={TRACER_COLOURS.overlay}
          />
        </Group>
      ) : null}
      {limbPoints.map((p, i) => (
        <Circle
          key={i}
          x={p.x}
          y={p.y}
          radius={px(4)}
          stroke={TRACER_COLOURS.overlay}
          strokeWidth={2}
          strokeScaleEnabled={false}
        />
      ))}
      {draft?.kind === "disk" ? (
        <Circle
          x={draft.cx}
          y={draft.cy}
          radius={draft.r}
          stroke={TRACER_COLOURS.overlay}
          strokeWidth={2}
          dash={[8, 5]}
          strokeScaleEnabled={false}
        />
      ) : null}
      {draft?.kind === "drift" ? (
        <Arrow
          points={[draft.from.x, draft.from.y, draft.to.x, draft.to.y]}
          stroke={TRACER_COLOURS.overlay}
          fill={TRACER_COLOURS.overlay}
          strokeWidth={2}
          pointerLength={px(12)}
          pointerWidth={px(10)}
          strokeScaleEnabled={false}
        />
      ) : null}
      {draft?.kind === "lasso" ? (
        <Line
          points={draft.points.flatMap((p) => [p.x, p.y])}
          closed
          stroke={TRACER_COLOURS.selected}
          strokeWidth={1.5}
          dash={[5, 4]}
          fill="rgba(245, 147, 17, 0.08)"
          strokeScaleEnabled={false}
        />
      ) : null}
      {draft?.kind === "box" ? (
        <Ellipse
          x={(draft.from.x + draft.to.x) / 2}
          y={(draft.from.y + draft.to.y) / 2}
          radiusX={Math.abs(draft.to.x - draft.from.x) / 2}
          radiusY={Math.abs(draft.to.y - draft.from.y) / 2}
          stroke={TRACER_COLOURS.area}
          strokeWidth={2}
          dash={[6, 4]}
          strokeScaleEnabled={false}
        />
      ) : null}
      {draft?.kind === "penumbra" ? (
        <Circle
          x={draft.at.x}
          y={draft.at.y}
          radius={draft.r}
          stroke={TRACER_COLOURS.penumbra}
          strokeWidth={1.5}
          dash={[4, 3]}
          strokeScaleEnabled={false}
        />
      ) : null}
      {suggestion?.map((s) => (
        <Group key={s.label}>
          <Circle
            x={s.cx}
            y={s.cy}
            radius={s.r}
            stroke={TRACER_COLOURS.area}
            strokeWidth={1.5}
            dash={[3, 3]}
            strokeScaleEnabled={false}
          />
          <Text
            text={s.label}
            x={s.cx + s.r * 0.72}
            y={s.cy - s.r * 0.72 - px(14)}
            fontSize={px(13)}
            fill={TRACER_COLOURS.area}
            fontStyle="bold"
          />
        </Group>
      ))}
    </Layer>
  );
});
