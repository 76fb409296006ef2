"use client";

import type Konva from "konva";
import { Circle, Group, Layer, Line, Stage, Text } from "react-konva";

import { BackgroundLayer, TRACER_COLOURS } from "@/components/tracer/canvas-layers";

import type { CandidateView, LimbDraft } from "./photo-assist";

/** Our own marks over the tracer's photo layer: proposed (amber, dashed), accepted (green), rejected (red cross). */
const MARK = {
  proposed: TRACER_COLOURS.overlay,
  accepted: TRACER_COLOURS.area,
  rejected: TRACER_COLOURS.outside,
  limb: TRACER_COLOURS.selected,
};

export default function PhotoAssistCanvas({
  imageUrl,
  widthPx,
  heightPx,
  displayWidth,
  brightness,
  contrast,
  limb,
  limbAccepted,
  candidates,
  selectedId,
  onLimbChange,
  onSelect,
  onMoveCandidate,
}: {
  imageUrl: string;
  widthPx: number;
  heightPx: number;
  displayWidth: number;
  /** In the tracing's units: a multiplier, 1 = unchanged. */
  brightness: number;
  contrast: number;
  limb: LimbDraft | null;
  limbAccepted: boolean;
  candidates: CandidateView[];
  selectedId: string | null;
  onLimbChange: (limb: LimbDraft) => void;
  onSelect: (id: string) => void;
  /** A candidate dragged to where the observer sees the spot. */
  onMoveCandidate: (id: string, xPx: number, yPx: number) => void;
}) {
  const scale = displayWidth / widthPx;
  const displayHeight = Math.round(heightPx * scale);
  // Marks keep the same on-screen size whatever the photo's resolution.
  const px = 1 / scale;
  const limbColour = limbAccepted ? MARK.accepted : MARK.limb;
  return (
    <Stage
      width={displayWidth}
      height={displayHeight}
      scaleX={scale}
      scaleY={scale}
      className="rounded-md bg-ink-900"
    >
      {/* The Disk tracer's own background layer: the same look controls as in the tracer. */}
      <BackgroundLayer
        width={widthPx}
        height={heightPx}
        imageUrl={imageUrl}
        brightness={brightness}
        contrast={contrast}
      />
      <Layer>
        {limb ? (
          <Group>
            <Circle
              x={limb.centreXPx}
              y={limb.centreYPx}
              radius={limb.radiusPx}
              stroke={limbColour}
              strokeWidth={2 * px}
              dash={limbAccepted ? undefined : [8 * px, 6 * px]}
              listening={false}
            />
            <Line
              points={[limb.centreXPx - 8 * px, limb.centreYPx, limb.centreXPx + 8 * px, limb.centreYPx]}
              stroke={limbColour}
              strokeWidth={1.5 * px}
              listening={false}
            />
            <Circle
              name="limb-centre"
              x={limb.centreXPx}
              y={limb.centreYPx}
              radius={7 * px}
              fill={limbColour}
              opacity={0.8}
              draggable
              onDragMove={(e: Konva.KonvaEventObject<DragEvent>) =>
                onLimbChange({ ...limb, centreXPx: e.target.x(), centreYPx: e.target.y() })
              }
            />
            <Circle
              name="limb-edge"
              x={limb.centreXPx + limb.radiusPx}
              y={limb.centreYPx}
              radius={7 * px}
              fill="#ffffff"
              stroke={limbColour}
              strokeWidth={2 * px}
              draggable
              dragBoundFunc={function (this: Konva.Node, pos) {
                // Only along the horizontal through the centre: the handle sets the radius.
                return { x: pos.x, y: this.getAbsolutePosition().y };
              }}
              onDragMove={(e: Konva.KonvaEventObject<DragEvent>) =>
                onLimbChange({ ...limb, radiusPx: Math.max(10, Math.abs(e.target.x() - limb.centreXPx)) })
              }
            />
          </Group>
        ) : null}
        {candidates.map((c, index) => {
          const colour = MARK[c.decision];
          const selected = c.id === selectedId;
          return (
            <Group
              key={c.id}
              x={c.xPx}
              y={c.yPx}
              draggable
              onClick={() => onSelect(c.id)}
              onTap={() => onSelect(c.id)}
              onDragStart={() => onSelect(c.id)}
              onDragEnd={(e: Konva.KonvaEventObject<DragEvent>) =>
                onMoveCandidate(c.id, e.target.x(), e.target.y())
              }
            >
              <Circle
                radius={Math.max(c.radiusPx * 1.4, 6 * px)}
                stroke={colour}
                strokeWidth={(selected ? 3 : 1.75) * px}
                dash={c.decision === "proposed" ? [4 * px, 3 * px] : undefined}
                hitStrokeWidth={12 * px}
              />
              {c.decision === "rejected" ? (
                <Line
                  points={[-5 * px, -5 * px, 5 * px, 5 * px, 0, 0, 5 * px, -5 * px, -5 * px, 5 * px]}
                  stroke={colour}
                  strokeWidth={1.5 * px}
                  listening={false}
                />
              ) : null}
              <Text
                text={String(index + 1)}
                x={Math.max(c.radiusPx * 1.4, 6 * px) + 2 * px}
                y={-6 * px}
                fontSize={12 * px}
                fill={colour}
                listening={false}
              />
            </Group>
          );
        })}
      </Layer>
    </Stage>
  );
}
