"use client";

import type Konva from "konva";
import Link from "next/link";
import { useCallback, useEffect, useLayoutEffect, useMemo, useReducer, useRef, useState } from "react";
import { Stage } from "react-konva";

import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { computeHeliographicGrid } from "@/lib/solar/grid";
import { diskToHeliographic } from "@/lib/solar/heliographic";
import { fitCircle } from "@/lib/tracer/circle-fit";
import {
  canRedo,
  canUndo,
  createEditorState,
  editorReducer,
  hasUnsavedChanges,
  type EditorAction,
} from "@/lib/tracer/editor";
import { placeGridOnTracing } from "@/lib/tracer/grid-placement";
import { DEFAULT_LINK_DISTANCE_DEG, suggestGroups } from "@/lib/tracer/grouping";
import { measureTracing, type ObservationCounts, type TracingProblem } from "@/lib/tracer/measure";
import { documentToSky, type PlanePoint } from "@/lib/tracer/orientation";
import { findSpotAt, selectInsideLasso } from "@/lib/tracer/selection";
import { checkTracingDocument, createEmptyTracing, type TracingDocument } from "@/lib/validation/tracing";

import { BackgroundLayer, DiskGridLayer, OverlayLayer, SpotsLayer, type Draft } from "./canvas-layers";
import { CountsPanel, countsToDraft, type CountDraft, type CountKey } from "./counts-panel";
import { GroupPanel } from "./group-panel";
import { SHORTCUTS, TOOLS, type ToolId } from "./shortcuts";

export type DiskTracerProps = {
  observationId: string;
  /** The observation instant: the grid and every position are computed for it. */
  observedAtIso: string;
  utDate: string;
  observationCounts: ObservationCounts;
  initialDocument: TracingDocument | null;
  /** 0 for a tracing not saved yet. */
  initialRevision: number;
  /** A photo of the projected disk to trace over (the photo feature passes it). */
  backgroundImageUrl?: string | null;
  /** CSS-style brightness multiplier for the photo, 1 = unchanged. */
  backgroundBrightness?: number;
  /** Contrast for the photo, −100 … 100, 0 = unchanged. */
  backgroundContrast?: number;
};

type View = { scale: number; x: number; y: number };
type Notice = { tone: "error" | "success" | "info"; text: string; details?: string[] };

type Gesture =
  | { kind: "pan"; startScreen: PlanePoint; startView: View }
  | {
      kind: "move";
      ids: string[];
      startDoc: PlanePoint;
      startScreen: PlanePoint;
      origins: Map<string, PlanePoint>;
      moved: boolean;
      /** Copies of the moving spots, drawn on the overlay while the originals are hidden. */
      ghosts: Array<{ id: string; node: Konva.Group }>;
    }
  | { kind: "lasso"; points: PlanePoint[]; additive: boolean; startScreen: PlanePoint; moved: boolean }
  | { kind: "disk"; centre: PlanePoint }
  | { kind: "drift"; from: PlanePoint }
  | { kind: "spot"; at: PlanePoint; startScreen: PlanePoint }
  | { kind: "box"; from: PlanePoint };

const TAP_SLOP_PX = 5;
const PICK_TOLERANCE_PX = 9;
const MIN_SCALE = 0.05;
const MAX_SCALE = 40;

function makeId(prefix: string): string {
  const bytes = new Uint8Array(8);
  crypto.getRandomValues(bytes);
  return `${prefix}${Array.from(bytes, (b) => b.toString(36).padStart(2, "0"))
    .join("")
    .slice(0, 12)}`;
}

function formatSigned(value: number): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(1)}°`;
}

function isTypingTarget(target: EventTarget | null): boolean {
  return (
    target instanceof HTMLElement &&
    (target.isContentEditable || ["INPUT", "SELECT", "TEXTAREA"].includes(target.tagName))
  );
}

export function DiskTracer(props: DiskTracerProps) {
  const { observationId, observedAtIso, utDate } = props;
  const [editor, dispatch] = useReducer(editorReducer, null, () => {
    const base = props.initialDocument ?? createEmptyTracing();
    // The photo feature may hand in a photo for a tracing that has none yet.
    const document =
      props.backgroundImageUrl && !base.background.imageUrl
        ? {
            ...base,
            background: {
              ...base.background,
              imageUrl: props.backgroundImageUrl,
              brightness: props.backgroundBrightness ?? base.background.brightness,
              contrast: props.backgroundContrast ?? base.background.contrast,
            },
          }
        : base;
    return createEditorState({ document });
  });
  const document = editor.document;

  const [tool, setTool] = useState<ToolId>(
    document.disk ? (document.orientation ? "spot" : "north") : "disk",
  );
  const [selectedIds, setSelectedIds] = useState<ReadonlySet<string>>(() => new Set());
  const [selectedGroupId, setSelectedGroupId] = useState<string | null>(null);
  const [limbPoints, setLimbPoints] = useState<PlanePoint[]>(() => document.disk?.limbPoints ?? []);
  const [mirroredDefault, setMirroredDefault] = useState(document.orientation?.mirrored ?? false);
  const [draft, setDraft] = useState<Draft | null>(null);
  const [view, setView] = useState<View>({ scale: 0.5, x: 0, y: 0 });
  const [stageSize, setStageSize] = useState({ width: 0, height: 0 });
  const [showGrid, setShowGrid] = useState(true);
  const [notice, setNotice] = useState<Notice | null>(null);
  const [revision, setRevision] = useState(props.initialRevision);
  const [storedCounts, setStoredCounts] = useState<ObservationCounts>(props.observationCounts);
  const [countDraft, setCountDraft] = useState<CountDraft | null>(null);
  const [countErrors, setCountErrors] = useState<Record<string, string>>({});
  const [saving, setSaving] = useState(false);
  const [linkDistanceDeg, setLinkDistanceDeg] = useState(DEFAULT_LINK_DISTANCE_DEG);
  const [suggestion, setSuggestion] = useState<string[][] | null>(null);

  const containerRef = useRef<HTMLDivElement>(null);
  const stageRef = useRef<Konva.Stage>(null);
  const spotsLayerRef = useRef<Konva.Layer>(null);
  const overlayLayerRef = useRef<Konva.Layer>(null);
  const readoutRef = useRef<HTMLSpanElement>(null);
  const nodes = useRef(new Map<string, Konva.Group>());
  const gesture = useRef<Gesture | null>(null);
  const pointers = useRef(new Map<number, PlanePoint>());
  const pinch = useRef<{ distance: number; mid: PlanePoint; view: View } | null>(null);
  const spaceHeld = useRef(false);
  const fitted = useRef(false);

  const sun = useMemo(() => solarOrientation(new Date(observedAtIso)), [observedAtIso]);
  const grid = useMemo(() => computeHeliographicGrid({ at: sun }), [sun]);
  const measurement = useMemo(() => measureTracing({ document, orientation: sun }), [document, sun]);
  const frame = measurement.frame;
  const placedGrid = useMemo(() => (frame ? placeGridOnTracing({ grid, frame }) : null), [grid, frame]);
  const outsideIds = useMemo(
    () => new Set(measurement.spots.filter((s) => s.outsideDisk).map((s) => s.id)),
    [measurement],
  );
  const groupLabels = useMemo(() => {
    const boxes = new Map<string, { maxX: number; minY: number }>();
    for (const spot of document.spots) {
      if (!spot.groupId) continue;
      const reach = spot.penumbraRadius ?? spot.umbraRadius;
      const box = boxes.get(spot.groupId) ?? { maxX: -Infinity, minY: Infinity };
      box.maxX = Math.max(box.maxX, spot.x + reach);
      box.minY = Math.min(box.minY, spot.y - reach);
      boxes.set(spot.groupId, box);
    }
    return document.groups.flatMap((g) => {
      const box = boxes.get(g.id);
      return box
        ? [{ id: g.id, number: g.number, x: box.maxX + 3 / view.scale, y: box.minY - 14 / view.scale }]
        : [];
    });
  }, [document, view.scale]);

  const suggestionShapes = useMemo(() => {
    if (!suggestion) return null;
    const byId = new Map(document.spots.map((s) => [s.id, s]));
    return suggestion.map((ids, i) => {
      const members = ids.flatMap((id) => (byId.get(id) ? [byId.get(id)!] : []));
      const cx = members.reduce((s, m) => s + m.x, 0) / members.length;
      const cy = members.reduce((s, m) => s + m.y, 0) / members.length;
      const r =
        Math.max(
          ...members.map((m) => Math.hypot(m.x - cx, m.y - cy) + (m.penumbraRadius ?? m.umbraRadius)),
        ) +
        8 / view.scale;
      return { cx, cy, r, label: `new ${i + 1}` };
    });
  }, [suggestion, document.spots, view.scale]);

  // Everything the event handlers read, kept fresh every render so handlers never see stale state.
  const latest = useRef({
    document,
    tool,
    selectedIds,
    view,
    frame,
    limbPoints,
    mirroredDefault,
    measurement,
  });
  useLayoutEffect(() => {
    latest.current = { document, tool, selectedIds, view, frame, limbPoints, mirroredDefault, measurement };
  });

  const act = useCallback((action: EditorAction) => {
    dispatch(action);
    setSuggestion(null);
    // An old message would describe a drawing that has changed; commands set a new one after this.
    setNotice(null);
  }, []);

  const registerNode = useCallback((id: string, node: Konva.Group | null) => {
    if (node) nodes.current.set(id, node);
    else nodes.current.delete(id);
  }, []);

  // ---------------------------------------------------------------- view

  const fitView = useCallback(() => {
    const { width, height } = stageSize;
    if (!width || !height) return;
    const doc = latest.current.document.canvas;
    const scale = Math.min(width / doc.width, height / doc.height) * 0.96;
    setView({ scale, x: (width - doc.width * scale) / 2, y: (height - doc.height * scale) / 2 });
  }, [stageSize]);

  useEffect(() => {
    const element = containerRef.current;
    if (!element) return;
    const observer = new ResizeObserver(([entry]) => {
      if (!entry) return;
      const width = Math.floor(entry.contentRect.width);
      // Square when there is room, but never taller than the window: the whole disk stays in view.
      setStageSize({
        width,
        height: Math.round(Math.max(360, Math.min(width, window.innerHeight - 160, 760))),
      });
    });
    observer.observe(element);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    if (!fitted.current && stageSize.width > 0) {
      fitted.current = true;
      fitView();
    }
  }, [stageSize, fitView]);

  const zoomAt = useCallback(
    (factor: number, screen?: PlanePoint) => {
      setView((v) => {
        const scale = Math.min(MAX_SCALE, Math.max(MIN_SCALE, v.scale * factor));
        const at = screen ?? { x: stageSize.width / 2, y: stageSize.height / 2 };
        const docX = (at.x - v.x) / v.scale;
        const docY = (at.y - v.y) / v.scale;
        return { scale, x: at.x - docX * scale, y: at.y - docY * scale };
      });
    },
    [stageSize],
  );

  // Wheel zoom needs a non-passive listener to stop the page from scrolling.
  useEffect(() => {
    const element = containerRef.current;
    if (!element) return;
    const onWheel = (event: WheelEvent) => {
      event.preventDefault();
      const rect = element.getBoundingClientRect();
      zoomAt(Math.exp(-event.deltaY * 0.0015), { x: event.clientX - rect.left, y: event.clientY - rect.top });
    };
    element.addEventListener("wheel", onWheel, { passive: false });
    return () => element.removeEventListener("wheel", onWheel);
  }, [zoomAt]);

  // ---------------------------------------------------------------- pointer input (mouse, touch, pen)

  const screenOf = (event: React.PointerEvent): PlanePoint => {
    const rect = containerRef.current!.getBoundingClientRect();
    return { x: event.clientX - rect.left, y: event.clientY - rect.top };
  };
  const docOf = (screen: PlanePoint): PlanePoint => {
    const v = latest.current.view;
    return { x: (screen.x - v.x) / v.scale, y: (screen.y - v.y) / v.scale };
  };

  /**
   * While spots are dragged, copies of them move on the small overlay layer
   * and only that layer is redrawn each frame; the layer holding every other
   * spot is redrawn once when the drag starts and once when it ends.
   */
  const liftMovedNodes = (g: Extract<Gesture, { kind: "move" }>) => {
    const overlay = overlayLayerRef.current;
    if (!overlay) return;
    for (const id of g.ids) {
      const node = nodes.current.get(id);
      if (!node) continue;
      const ghost = node.clone({ listening: false }) as Konva.Group;
      overlay.add(ghost);
      node.hide();
      g.ghosts.push({ id, node: ghost });
    }
    spotsLayerRef.current?.batchDraw();
  };

  const dropMovedNodes = (g: Extract<Gesture, { kind: "move" }>, offset: PlanePoint) => {
    for (const ghost of g.ghosts) ghost.node.destroy();
    g.ghosts = [];
    for (const [id, origin] of g.origins)
      nodes.current
        .get(id)
        ?.position({ x: origin.x + offset.x, y: origin.y + offset.y })
        .show();
    overlayLayerRef.current?.batchDraw();
    spotsLayerRef.current?.batchDraw();
  };

  const restoreMovedNodes = (g: Extract<Gesture, { kind: "move" }>) => dropMovedNodes(g, { x: 0, y: 0 });

  const onPointerDown = (event: React.PointerEvent<HTMLDivElement>) => {
    const screen = screenOf(event);
    pointers.current.set(event.pointerId, screen);
    event.currentTarget.setPointerCapture(event.pointerId);
    containerRef.current?.focus({ preventScroll: true });

    if (pointers.current.size === 2) {
      // A second finger turns whatever the first one started into a pinch.
      const g = gesture.current;
      if (g?.kind === "move") restoreMovedNodes(g);
      gesture.current = null;
      setDraft(null);
      const [a, b] = [...pointers.current.values()] as [PlanePoint, PlanePoint];
      pinch.current = {
        distance: Math.hypot(a.x - b.x, a.y - b.y),
        mid: { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 },
        view: latest.current.view,
      };
      return;
    }
    if (pointers.current.size > 2) return;

    const { tool: current, document: doc, selectedIds: selection, view: v } = latest.current;
    const at = docOf(screen);
    if (event.button === 1 || spaceHeld.current || current === "pan") {
      gesture.current = { kind: "pan", startScreen: screen, startView: v };
      return;
    }
    if (event.button !== 0) return;

    switch (current) {
      case "select": {
        const hit = findSpotAt({ spots: doc.spots, point: at, toleranceUnits: PICK_TOLERANCE_PX / v.scale });
        if (hit) {
          let ids = selection;
          if (event.shiftKey) {
            const next = new Set(selection);
            if (next.has(hit)) next.delete(hit);
            else next.add(hit);
            ids = next;
            setSelectedIds(next);
          } else if (!selection.has(hit)) {
            ids = new Set([hit]);
            setSelectedIds(ids);
            setSelectedGroupId(null);
          }
          const origins = new Map<string, PlanePoint>();
          for (const spot of doc.spots) if (ids.has(spot.id)) origins.set(spot.id, { x: spot.x, y: spot.y });
          gesture.current = {
            kind: "move",
            ids: [...origins.keys()],
            startDoc: at,
            startScreen: screen,
            origins,
            moved: false,
            ghosts: [],
          };
        } else {
          gesture.current = {
            kind: "lasso",
            points: [at],
            additive: event.shiftKey,
            startScreen: screen,
            moved: false,
          };
        }
        return;
      }
      case "spot": {
        if (!doc.disk) {
          setNotice({
            tone: "error",
            text: "Fit the disk before placing spots: drag a circle over it, or click points on its limb.",
          });
          return;
        }
        if (Math.hypot(at.x - doc.disk.cx, at.y - doc.disk.cy) > doc.disk.r) {
          setNotice({ tone: "error", text: "A spot must lie on the disk. That point is outside the limb." });
          return;
        }
        gesture.current = { kind: "spot", at, startScreen: screen };
        return;
      }
      case "disk":
        gesture.current = { kind: "disk", centre: at };
        setDraft({ kind: "disk", cx: at.x, cy: at.y, r: 0 });
        return;
      case "limb":
        setLimbPoints((points) => [...points, at]);
        return;
      case "north": {
        if (!doc.disk) {
          setNotice({ tone: "error", text: "Fit the disk first; the north mark is read from its centre." });
          return;
        }
        if (Math.hypot(at.x - doc.disk.cx, at.y - doc.disk.cy) < doc.disk.r * 0.05) {
          setNotice({ tone: "error", text: "Click further from the centre, toward celestial north." });
          return;
        }
        act({
          type: "set-orientation",
          orientation: { mode: "north", point: at, mirrored: latest.current.mirroredDefault },
        });
        setNotice({
          tone: "success",
          text: "North marked. The grid shows the Sun for the observation time.",
        });
        return;
      }
      case "drift":
        gesture.current = { kind: "drift", from: at };
        setDraft({ kind: "drift", from: at, to: at });
        return;
      case "area": {
        gesture.current = { kind: "box", from: at };
        setDraft({ kind: "box", from: at, to: at });
        return;
      }
      default:
        return;
    }
  };

  const onPointerMove = (event: React.PointerEvent<HTMLDivElement>) => {
    const screen = screenOf(event);
    if (pointers.current.has(event.pointerId)) pointers.current.set(event.pointerId, screen);

    const p = pinch.current;
    if (p && pointers.current.size >= 2) {
      const [a, b] = [...pointers.current.values()] as [PlanePoint, PlanePoint];
      const distance = Math.hypot(a.x - b.x, a.y - b.y);
      const mid = { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 };
      const scale = Math.min(
        MAX_SCALE,
        Math.max(MIN_SCALE, p.view.scale * (distance / Math.max(p.distance, 1))),
      );
      const docX = (p.mid.x - p.view.x) / p.view.scale;
      const docY = (p.mid.y - p.view.y) / p.view.scale;
      setView({ scale, x: mid.x - docX * scale, y: mid.y - docY * scale });
      return;
    }

    const at = docOf(screen);
    const g = gesture.current;
    if (!g) {
      updateReadout(at);
      return;
    }
    switch (g.kind) {
      case "pan":
        setView({
          ...g.startView,
          x: g.startView.x + screen.x - g.startScreen.x,
          y: g.startView.y + screen.y - g.startScreen.y,
        });
        return;
      case "move": {
        if (!g.moved && Math.hypot(screen.x - g.startScreen.x, screen.y - g.startScreen.y) < TAP_SLOP_PX)
          return;
        if (!g.moved) liftMovedNodes(g);
        g.moved = true;
        const dx = at.x - g.startDoc.x;
        const dy = at.y - g.startDoc.y;
        // Move the Konva nodes directly: React renders once, when the drag ends.
        for (const ghost of g.ghosts) {
          const origin = g.origins.get(ghost.id);
          if (origin) ghost.node.position({ x: origin.x + dx, y: origin.y + dy });
        }
        overlayLayerRef.current?.batchDraw();
        updateReadout(at);
        return;
      }
      case "lasso":
        // A lasso usually ends where it began: whether it is a tap depends on the whole path.
        if (Math.hypot(screen.x - g.startScreen.x, screen.y - g.startScreen.y) >= TAP_SLOP_PX) g.moved = true;
        g.points.push(at);
        setDraft({ kind: "lasso", points: [...g.points] });
        return;
      case "disk":
        setDraft({
          kind: "disk",
          cx: g.centre.x,
          cy: g.centre.y,
          r: Math.hypot(at.x - g.centre.x, at.y - g.centre.y),
        });
        return;
      case "drift":
        setDraft({ kind: "drift", from: g.from, to: at });
        return;
      case "spot": {
        const r = Math.hypot(at.x - g.at.x, at.y - g.at.y);
        if (Math.hypot(screen.x - g.startScreen.x, screen.y - g.startScreen.y) >= TAP_SLOP_PX)
          setDraft({ kind: "penumbra", at: g.at, r });
        return;
      }
      case "box":
        setDraft({ kind: "box", from: g.from, to: at });
        return;
    }
  };

  const endPointer = (event: React.PointerEvent<HTMLDivElement>, cancelled: boolean) => {
    pointers.current.delete(event.pointerId);
    if (pinch.current) {
      if (pointers.current.size < 2) pinch.current = null;
      return;
    }
    const g = gesture.current;
    gesture.current = null;
    setDraft(null);
    if (!g) return;
    if (cancelled) {
      if (g.kind === "move") restoreMovedNodes(g);
      return;
    }
    const screen = screenOf(event);
    const at = docOf(screen);
    const { document: doc, view: v, selectedIds: selection } = latest.current;
    switch (g.kind) {
      case "move": {
        if (!g.moved) return;
        const offset = { x: at.x - g.startDoc.x, y: at.y - g.startDoc.y };
        dropMovedNodes(g, offset);
        act({ type: "move-spots", ids: g.ids, dx: offset.x, dy: offset.y });
        return;
      }
      case "lasso": {
        if (!g.moved) {
          if (!g.additive) {
            setSelectedIds(new Set());
            setSelectedGroupId(null);
          }
          return;
        }
        const inside = selectInsideLasso({ spots: doc.spots, lasso: g.points });
        setSelectedIds(new Set([...(g.additive ? selection : []), ...inside]));
        setSelectedGroupId(null);
        return;
      }
      case "disk": {
        const r = Math.hypot(at.x - g.centre.x, at.y - g.centre.y);
        if (r * v.scale < 10) {
          setNotice({ tone: "error", text: "Drag out from the disk centre to its limb to draw the disk." });
          return;
        }
        act({
          type: "set-disk",
          disk: { cx: g.centre.x, cy: g.centre.y, r, method: "drag", limbPoints: [] },
        });
        setNotice({
          tone: "success",
          text: doc.orientation
            ? "Disk drawn."
            : "Disk drawn. Now orient it: mark north (N) or draw the drift line (W).",
        });
        if (!doc.orientation) setTool("north");
        return;
      }
      case "drift": {
        if (Math.hypot(at.x - g.from.x, at.y - g.from.y) * v.scale < 10) {
          setNotice({
            tone: "error",
            text: "Drag the drift line along the way the image drifts, at least a little way.",
          });
          return;
        }
        act({
          type: "set-orientation",
          orientation: { mode: "drift", from: g.from, to: at, mirrored: latest.current.mirroredDefault },
        });
        setNotice({ tone: "success", text: "Drift line drawn: its arrow points to celestial west." });
        return;
      }
      case "spot": {
        if (!doc.disk) return;
        const umbraRadius = Math.max(1.5, doc.disk.r * 0.012);
        const drag = Math.hypot(at.x - g.at.x, at.y - g.at.y);
        const dragged = Math.hypot(screen.x - g.startScreen.x, screen.y - g.startScreen.y) >= TAP_SLOP_PX;
        const id = makeId("s");
        act({
          type: "add-spot",
          spot: {
            id,
            x: g.at.x,
            y: g.at.y,
            umbraRadius,
            penumbraRadius: dragged && drag > umbraRadius ? drag : null,
            groupId: null,
          },
        });
        setSelectedIds(new Set([id]));
        return;
      }
      case "box": {
        const rx = Math.abs(at.x - g.from.x) / 2;
        const ry = Math.abs(at.y - g.from.y) / 2;
        if (rx * v.scale < 2 || ry * v.scale < 2) {
          setNotice({ tone: "error", text: "Drag a box around the spot or group to draw its area." });
          return;
        }
        const target = areaTarget();
        if (!target) {
          setNotice({
            tone: "error",
            text: "Select one spot, or one group in the list, before drawing an area.",
          });
          return;
        }
        act({
          type: "set-area",
          target,
          area: { cx: (at.x + g.from.x) / 2, cy: (at.y + g.from.y) / 2, rx, ry, rotationDeg: 0 },
        });
        return;
      }
      case "pan":
        return;
    }
  };

  const updateReadout = (at: PlanePoint) => {
    const element = readoutRef.current;
    const f = latest.current.frame;
    if (!element) return;
    if (!f) {
      element.textContent = "";
      return;
    }
    const position = diskToHeliographic(documentToSky({ point: at, frame: f }), sun);
    element.textContent = position
      ? `Lat ${formatSigned(position.lat)} · CMD ${formatSigned(position.lon)} · Carrington ${position.carringtonLon.toFixed(1)}°`
      : "Off the disk";
  };

  // ---------------------------------------------------------------- commands

  const areaTarget = () => {
    const ids = [...latest.current.selectedIds];
    if (selectedGroupId) return { kind: "group" as const, id: selectedGroupId };
    if (ids.length === 1) return { kind: "spot" as const, id: ids[0]! };
    return null;
  };

  const fitLimb = () => {
    const result = fitCircle({ points: latest.current.limbPoints });
    if (!result.ok) {
      setNotice({ tone: "error", text: result.message });
      return;
    }
    const { cx, cy, r } = result.circle;
    act({
      type: "set-disk",
      disk: { cx, cy, r, method: "limb-points", limbPoints: latest.current.limbPoints },
    });
    setLimbPoints([]);
    setNotice({
      tone: "success",
      text: `Disk fitted to ${latest.current.limbPoints.length} limb points (scatter ${result.circle.rmsResidual.toFixed(1)} px).${
        latest.current.document.orientation
          ? ""
          : " Now orient it: mark north (N) or draw the drift line (W)."
      }`,
    });
    if (!latest.current.document.orientation) setTool("north");
  };

  const groupSelected = () => {
    const ids = [...latest.current.selectedIds];
    if (ids.length === 0) {
      setNotice({
        tone: "error",
        text: "Select the spots of one group first (click with Shift, or lasso them).",
      });
      return;
    }
    const id = makeId("g");
    act({ type: "group-spots", ids, newGroupId: id });
    setSelectedGroupId(id);
  };

  const ungroupSelected = () => {
    const ids = [...latest.current.selectedIds];
    if (ids.length > 0) act({ type: "ungroup-spots", ids });
  };

  const deleteSelected = () => {
    const ids = [...latest.current.selectedIds];
    if (ids.length === 0) return;
    act({ type: "delete-spots", ids });
    setSelectedIds(new Set());
  };

  const suggest = () => {
    const { frame: f, document: doc, measurement: m } = latest.current;
    if (!f) {
      setNotice({
        tone: "error",
        text: "Fit and orient the disk first: groups are suggested by distance on the Sun.",
      });
      return;
    }
    const ungrouped = new Set(doc.spots.filter((s) => s.groupId === null).map((s) => s.id));
    const placed = m.spots.flatMap((s) =>
      ungrouped.has(s.id) && s.position ? [{ id: s.id, lat: s.position.lat, lon: s.position.lon }] : [],
    );
    if (placed.length === 0) {
      setNotice({
        tone: "info",
        text: "Every spot on the disk is already in a group. Take spots out of their group (U) to have them suggested again.",
      });
      return;
    }
    const clusters = suggestGroups({ spots: placed, linkDistanceDeg });
    setSuggestion(clusters);
    setNotice({
      tone: "info",
      text: `Suggested ${clusters.length} ${clusters.length === 1 ? "group" : "groups"} for ${placed.length} ungrouped ${placed.length === 1 ? "spot" : "spots"} (spots within ${linkDistanceDeg}° of each other). Accept, or group by hand.`,
    });
  };

  const acceptSuggestion = () => {
    if (!suggestion) return;
    act({
      type: "apply-groups",
      clusters: suggestion.map((spotIds) => ({ spotIds, newGroupId: makeId("g") })),
    });
    setNotice({ tone: "success", text: "Groups made. Give each one its classes." });
  };

  const renumberEastToWest = () => {
    const ordered = [...latest.current.measurement.groups]
      .sort((a, b) => a.cmdDeg - b.cmdDeg)
      .map((g) => g.id);
    act({ type: "renumber-groups", orderedIds: ordered });
  };

  const selectGroup = useCallback((id: string | null) => {
    setSelectedGroupId(id);
    setSelectedIds(
      new Set(id ? latest.current.document.spots.filter((s) => s.groupId === id).map((s) => s.id) : []),
    );
  }, []);

  // ---------------------------------------------------------------- saving

  const exportPng = (): string | null => {
    const stage = stageRef.current;
    if (!stage) return null;
    const { width, height } = latest.current.document.canvas;
    const saved = { scaleX: stage.scaleX(), scaleY: stage.scaleY(), x: stage.x(), y: stage.y() };
    const rings = stage.find(".selection-ring");
    overlayLayerRef.current?.hide();
    rings.forEach((n) => n.hide());
    stage.scale({ x: 1, y: 1 });
    stage.position({ x: 0, y: 0 });
    try {
      return stage.toDataURL({
        x: 0,
        y: 0,
        width,
        height,
        pixelRatio: Math.min(1, 1200 / Math.max(width, height)),
        mimeType: "image/png",
      });
    } catch {
      // A photo served without CORS taints the canvas; the vector tracing is still saved.
      return null;
    } finally {
      stage.scale({ x: saved.scaleX, y: saved.scaleY });
      stage.position({ x: saved.x, y: saved.y });
      overlayLayerRef.current?.show();
      rings.forEach((n) => n.show());
      stage.batchDraw();
    }
  };

  const save = async () => {
    if (saving) return;
    const doc = latest.current.document;
    const checked = checkTracingDocument(doc);
    if (!checked.ok) {
      setNotice({ tone: "error", text: checked.message, details: checked.issues.map((i) => i.message) });
      return;
    }
    const problems = latest.current.measurement.problems;
    if (problems.length > 0) {
      setNotice({
        tone: "error",
        text: "The tracing is not ready to save yet:",
        details: problems.map((p) => p.message),
      });
      return;
    }
    let counts: ObservationCounts | undefined;
    if (countDraft) {
      const errors: Record<string, string> = {};
      const read = (key: CountKey, optional: boolean): number | null => {
        const text = countDraft[key].trim();
        if (text === "" && optional) return null;
        const value = Number(text);
        if (!Number.isInteger(value) || value < 0)
          errors[key] =
            `${key === "groups" ? "g" : key === "spots" ? "s" : key} must be a whole number, 0 or more.`;
        return value;
      };
      counts = {
        groups: read("groups", false)!,
        spots: read("spots", false)!,
        northGroups: read("northGroups", true),
        northSpots: read("northSpots", true),
        southGroups: read("southGroups", true),
        southSpots: read("southSpots", true),
      };
      if (Object.keys(errors).length > 0) {
        setCountErrors(errors);
        return;
      }
    }
    setCountErrors({});
    setSaving(true);
    setNotice({ tone: "info", text: "Saving…" });
    try {
      const png = exportPng();
      const res = await fetch(`/api/v1/observations/${observationId}/tracing`, {
        method: "PUT",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ document: doc, png, baseRevision: revision, ...(counts ? { counts } : {}) }),
      });
      const body = await res.json().catch(() => null);
      if (!res.ok) {
        const issues: Array<{ path: string; message: string }> = body?.error?.issues ?? [];
        const fieldErrors: Record<string, string> = {};
        for (const issue of issues)
          if (issue.path.startsWith("counts.")) fieldErrors[issue.path.slice(7)] ??= issue.message;
        setCountErrors(fieldErrors);
        setNotice({
          tone: "error",
          text: body?.error?.message ?? "The tracing could not be saved.",
          details: issues.filter((i) => !i.path.startsWith("counts.")).map((i) => i.message),
        });
        return;
      }
      dispatch({ type: "mark-saved" });
      setRevision(body.revision);
      setStoredCounts(body.counts);
      setCountDraft(body.differsFromTracing ? countsToDraft(body.counts) : null);
      setNotice({
        tone: "success",
        text: `Saved (revision ${body.revision}): g ${body.counts.groups}, s ${body.counts.spots} in the observation.`,
      });
    } catch {
      setNotice({
        tone: "error",
        text: "No connection to Heliotally. Your tracing is still here; try saving again.",
      });
    } finally {
      setSaving(false);
    }
  };

  // ---------------------------------------------------------------- keyboard

  const commands = useRef({
    save,
    fitLimb,
    groupSelected,
    ungroupSelected,
    deleteSelected,
    suggest,
    fitView,
    zoomAt,
  });
  useLayoutEffect(() => {
    commands.current = {
      save,
      fitLimb,
      groupSelected,
      ungroupSelected,
      deleteSelected,
      suggest,
      fitView,
      zoomAt,
    };
  });

  useEffect(() => {
    const onKeyDown = (event: KeyboardEvent) => {
      if (isTypingTarget(event.target)) return;
      const c = commands.current;
      const key = event.key.toLowerCase();
      const mod = event.ctrlKey || event.metaKey;
      if (mod && key === "z") {
        event.preventDefault();
        dispatch({ type: event.shiftKey ? "redo" : "undo" });
        return;
      }
      if (mod && key === "y") {
        event.preventDefault();
        dispatch({ type: "redo" });
        return;
      }
      if (mod && key === "s") {
        event.preventDefault();
        void c.save();
        return;
      }
      if (mod || event.altKey) return;
      if (
        event.key === " " &&
        (event.target === containerRef.current || event.target === window.document.body)
      ) {
        spaceHeld.current = true;
        event.preventDefault();
        return;
      }
      const toolHit = TOOLS.find((t) => t.key === key);
      if (toolHit) {
        setTool(toolHit.id);
        return;
      }
      const nudge = event.shiftKey ? 10 : 1;
      const arrows: Record<string, [number, number]> = {
        arrowleft: [-1, 0],
        arrowright: [1, 0],
        arrowup: [0, -1],
        arrowdown: [0, 1],
      };
      const arrow = arrows[key];
      if (arrow && latest.current.selectedIds.size > 0) {
        event.preventDefault();
        const step = nudge / latest.current.view.scale;
        dispatch({
          type: "move-spots",
          ids: [...latest.current.selectedIds],
          dx: arrow[0] * step,
          dy: arrow[1] * step,
        });
        return;
      }
      switch (event.key) {
        case "g":
          c.groupSelected();
          return;
        case "G":
          c.suggest();
          return;
        case "u":
        case "U":
          c.ungroupSelected();
          return;
        case "Delete":
        case "Backspace":
          event.preventDefault();
          c.deleteSelected();
          return;
        case "Enter":
          if (latest.current.tool === "limb") c.fitLimb();
          return;
        case "m":
        case "M": {
          const next = !latest.current.mirroredDefault;
          setMirroredDefault(next);
          dispatch({ type: "set-mirrored", mirrored: next });
          return;
        }
        case "t":
        case "T":
          setShowGrid((s) => !s);
          return;
        case "+":
        case "=":
          c.zoomAt(1.25);
          return;
        case "-":
        case "_":
          c.zoomAt(0.8);
          return;
        case "0":
          c.fitView();
          return;
        case "Escape":
          gesture.current = null;
          setDraft(null);
          setSelectedIds(new Set());
          setSelectedGroupId(null);
          setSuggestion(null);
          return;
      }
    };
    const onKeyUp = (event: KeyboardEvent) => {
      if (event.key === " ") spaceHeld.current = false;
    };
    window.addEventListener("keydown", onKeyDown);
    window.addEventListener("keyup", onKeyUp);
    return () => {
      window.removeEventListener("keydown", onKeyDown);
      window.removeEventListener("keyup", onKeyUp);
    };
  }, []);

  const unsaved = hasUnsavedChanges(editor);
  useEffect(() => {
    if (!unsaved) return;
    const warn = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [unsaved]);

  // ---------------------------------------------------------------- render

  const selectedSpot =
    selectedIds.size === 1 ? (document.spots.find((s) => selectedIds.has(s.id)) ?? null) : null;
  const selectedSpotMeasure = selectedSpot ? measurement.spots.find((s) => s.id === selectedSpot.id) : null;
  const activeTool = TOOLS.find((t) => t.id === tool)!;
  const steps = [
    { label: "Fit the disk", done: Boolean(document.disk) },
    { label: "Orient it", done: Boolean(document.orientation) },
    { label: "Place spots", done: document.spots.length > 0 },
    {
      label: "Group and classify",
      done: document.spots.length > 0 && document.spots.every((s) => s.groupId !== null),
    },
    { label: "Save", done: !unsaved && revision > 0 },
  ];
  const problemsToShow: TracingProblem[] = measurement.problems.filter(
    (p) => p.path !== "disk" && p.path !== "orientation",
  );

  return (
    <div className="flex flex-col gap-4">
      <ol className="flex flex-wrap gap-2 text-xs" aria-label="Steps">
        {steps.map((step, i) => (
          <li
            key={step.label}
            className={`rounded-full px-3 py-1 ${step.done ? "bg-meadow-50 text-meadow-700" : "bg-ink-100 text-ink-700"}`}
          >
            {i + 1}. {step.label}
            {step.done ? " ✓" : ""}
          </li>
        ))}
      </ol>

      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="flex min-w-0 flex-col gap-2">
          <div role="toolbar" aria-label="Tracer tools" className="flex flex-wrap items-center gap-1">
            {TOOLS.map((t) => (
              <button
                key={t.id}
                type="button"
                onClick={() => setTool(t.id)}
                aria-pressed={tool === t.id}
                title={`${t.hint} (${t.key.toUpperCase()})`}
                className={`rounded-md border px-2.5 py-1.5 text-sm ${
                  tool === t.id
                    ? "border-corona-600 bg-corona-100 font-semibold text-ink-950"
                    : "border-ink-200 bg-white text-ink-800 hover:bg-ink-50"
                }`}
              >
                {t.label} <kbd className="text-xs text-ink-500">{t.key.toUpperCase()}</kbd>
              </button>
            ))}
            <span className="mx-1 h-6 w-px bg-ink-200" aria-hidden />
            <button
              type="button"
              className="rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm disabled:text-ink-300"
              disabled={!canUndo(editor)}
              onClick={() => dispatch({ type: "undo" })}
            >
              Undo
            </button>
            <button
              type="button"
              className="rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm disabled:text-ink-300"
              disabled={!canRedo(editor)}
              onClick={() => dispatch({ type: "redo" })}
            >
              Redo
            </button>
            <button
              type="button"
              className="rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm"
              onClick={() => zoomAt(1.25)}
              aria-label="Zoom in"
            >
              +
            </button>
            <button
              type="button"
              className="rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm"
              onClick={() => zoomAt(0.8)}
              aria-label="Zoom out"
            >
              −
            </button>
            <button
              type="button"
              className="rounded-md border border-ink-200 bg-white px-2.5 py-1.5 text-sm"
              onClick={fitView}
            >
              Fit view
            </button>
          </div>
          <p className="text-xs text-ink-600" data-testid="tool-hint">
            <strong>{activeTool.label}:</strong> {activeTool.hint}
          </p>
          <div
            ref={containerRef}
            tabIndex={0}
            data-testid="tracer-stage"
            aria-label="Disk tracer drawing area"
            className={`relative w-full touch-none overflow-hidden rounded-lg border border-ink-200 bg-ink-100 outline-none select-none focus-visible:ring-2 focus-visible:ring-corona-500 ${
              tool === "pan" ? "cursor-grab" : tool === "select" ? "cursor-default" : "cursor-crosshair"
            }`}
            style={{ height: stageSize.height || 480 }}
            onPointerDown={onPointerDown}
            onPointerMove={onPointerMove}
            onPointerUp={(e) => endPointer(e, false)}
            onPointerCancel={(e) => endPointer(e, true)}
            onContextMenu={(e) => e.preventDefault()}
          >
            {stageSize.width > 0 ? (
              <Stage
                ref={stageRef}
                width={stageSize.width}
                height={stageSize.height}
                scaleX={view.scale}
                scaleY={view.scale}
                x={view.x}
                y={view.y}
                listening={false}
              >
                <BackgroundLayer
                  width={document.canvas.width}
                  height={document.canvas.height}
                  imageUrl={document.background.imageUrl}
                  brightness={document.background.brightness}
                  contrast={document.background.contrast}
                />
                <DiskGridLayer
                  disk={document.disk}
                  frame={frame}
                  grid={placedGrid}
                  showGrid={showGrid}
                  hasImage={Boolean(document.background.imageUrl)}
                  screenScale={view.scale}
                />
                <SpotsLayer
                  document={document}
                  groupLabels={groupLabels}
                  selectedIds={selectedIds}
                  outsideIds={outsideIds}
                  highlightedGroupId={selectedGroupId}
                  screenScale={view.scale}
                  registerNode={registerNode}
                  layerRef={spotsLayerRef}
                />
                <OverlayLayer
                  draft={draft}
                  limbPoints={limbPoints}
                  orientation={document.orientation}
                  disk={document.disk}
                  suggestion={suggestionShapes}
                  screenScale={view.scale}
                  layerRef={overlayLayerRef}
                />
              </Stage>
            ) : null}
            <span
              ref={readoutRef}
              aria-live="off"
              className="pointer-events-none absolute bottom-2 left-2 rounded bg-white/85 px-2 py-0.5 text-xs text-ink-800"
            />
          </div>
          {notice ? (
            <div data-testid="tracer-notice">
              <FormMessage tone={notice.tone}>
                {notice.text}
                {notice.details && notice.details.length > 0 ? (
                  <ul className="mt-1 list-disc pl-5">
                    {notice.details.slice(0, 8).map((d) => (
                      <li key={d}>{d}</li>
                    ))}
                  </ul>
                ) : null}
              </FormMessage>
            </div>
          ) : null}
          <details className="rounded-md border border-ink-100 bg-white p-3 text-sm">
            <summary className="cursor-pointer font-semibold text-ink-900">Keyboard shortcuts</summary>
            <dl className="mt-2 grid grid-cols-[10rem_1fr] gap-x-3 gap-y-1 text-xs">
              {SHORTCUTS.map((s) => (
                <div key={s.keys} className="contents">
                  <dt className="font-mono text-ink-900">{s.keys}</dt>
                  <dd className="text-ink-700">{s.does}</dd>
                </div>
              ))}
            </dl>
            <p className="mt-2 text-xs text-ink-600">
              On a tablet: one finger or the pen draws with the chosen tool, two fingers pan and zoom.
            </p>
          </details>
        </div>

        <aside className="flex flex-col gap-4" aria-label="Tracing details">
          <section className="rounded-lg border border-ink-100 bg-white p-3 text-sm">
            <h2 className="font-semibold text-ink-900">Disk and orientation</h2>
            <p className="mt-1 text-xs text-ink-600">
              Sun at {observedAtIso.slice(0, 16).replace("T", " ")} UT: P {formatSigned(sun.p)}, B0{" "}
              {formatSigned(sun.b0)}, L0 {sun.l0.toFixed(1)}°, rotation {Math.floor(sun.carringtonRotation)}.
            </p>
            <p className="mt-2" data-testid="disk-status">
              {document.disk
                ? `Disk: ${document.disk.method === "drag" ? "dragged" : `fitted to ${document.disk.limbPoints.length} limb points`}, radius ${document.disk.r.toFixed(0)}.`
                : "Disk: not fitted yet."}
            </p>
            {tool === "limb" || limbPoints.length > 0 ? (
              <div className="mt-2 flex flex-wrap items-center gap-2">
                <span className="text-xs text-ink-700">{limbPoints.length} limb points</span>
                <Button type="button" variant="secondary" className="px-2 py-1 text-xs" onClick={fitLimb}>
                  Fit circle
                </Button>
                <Button
                  type="button"
                  variant="quiet"
                  className="px-2 py-1 text-xs"
                  onClick={() => setLimbPoints([])}
                >
                  Clear points
                </Button>
              </div>
            ) : null}
            <p className="mt-1" data-testid="orientation-status">
              {document.orientation
                ? document.orientation.mode === "north"
                  ? "Oriented by a north mark."
                  : "Oriented by the drift line (drift = west)."
                : "Orientation: not set. Mark north (N) or draw the drift line (W)."}
            </p>
            <label className="mt-2 flex items-center gap-2">
              <input
                type="checkbox"
                checked={document.orientation?.mirrored ?? mirroredDefault}
                onChange={(e) => {
                  setMirroredDefault(e.target.checked);
                  act({ type: "set-mirrored", mirrored: e.target.checked });
                }}
                className="size-4 accent-corona-600"
              />
              Mirrored image (star diagonal, mirror, or card seen from the telescope side)
            </label>
            <label className="mt-1 flex items-center gap-2">
              <input
                type="checkbox"
                checked={showGrid}
                onChange={(e) => setShowGrid(e.target.checked)}
                className="size-4 accent-corona-600"
              />
              Heliographic grid (10°)
            </label>
            {document.background.imageUrl ? (
              <div className="mt-2 grid grid-cols-[5rem_1fr] items-center gap-2 text-xs">
                <label htmlFor="bg-brightness">Brightness</label>
                <input
                  id="bg-brightness"
                  type="range"
                  min={0.2}
                  max={3}
                  step={0.05}
                  value={document.background.brightness}
                  onChange={(e) =>
                    act({ type: "set-background", patch: { brightness: Number(e.target.value) } })
                  }
                />
                <label htmlFor="bg-contrast">Contrast</label>
                <input
                  id="bg-contrast"
                  type="range"
                  min={-100}
                  max={100}
                  step={1}
                  value={document.background.contrast}
                  onChange={(e) =>
                    act({ type: "set-background", patch: { contrast: Number(e.target.value) } })
                  }
                />
              </div>
            ) : null}
          </section>

          <section className="rounded-lg border border-ink-100 bg-white p-3 text-sm">
            <h2 className="font-semibold text-ink-900">Spots</h2>
            <p className="mt-1 text-xs text-ink-600">
              {document.spots.length} placed, {selectedIds.size} selected.
            </p>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button
                type="button"
                variant="secondary"
                className="px-2 py-1 text-xs"
                onClick={groupSelected}
                disabled={selectedIds.size === 0}
              >
                Group selected (G)
              </Button>
              <Button
                type="button"
                variant="secondary"
                className="px-2 py-1 text-xs"
                onClick={ungroupSelected}
                disabled={selectedIds.size === 0}
              >
                Ungroup (U)
              </Button>
              <Button
                type="button"
                variant="secondary"
                className="px-2 py-1 text-xs"
                onClick={deleteSelected}
                disabled={selectedIds.size === 0}
              >
                Delete
              </Button>
            </div>
            {selectedSpot ? (
              <div
                className="mt-2 grid grid-cols-[6rem_1fr] items-center gap-x-2 gap-y-1 text-xs"
                data-testid="spot-details"
              >
                <label htmlFor="spot-umbra">Umbra size</label>
                <input
                  id="spot-umbra"
                  type="number"
                  min={0.5}
                  step={0.5}
                  value={Number(selectedSpot.umbraRadius.toFixed(2))}
                  onChange={(e) => {
                    const v = Number(e.target.value);
                    if (v > 0 && (selectedSpot.penumbraRadius === null || v <= selectedSpot.penumbraRadius)) {
                      act({ type: "update-spot", id: selectedSpot.id, patch: { umbraRadius: v } });
                    }
                  }}
                  className="w-24 rounded border border-ink-200 px-1 py-0.5"
                />
                <label htmlFor="spot-penumbra">Penumbra size</label>
                <input
                  id="spot-penumbra"
                  type="number"
                  min={0}
                  step={0.5}
                  placeholder="none"
                  value={
                    selectedSpot.penumbraRadius === null ? "" : Number(selectedSpot.penumbraRadius.toFixed(2))
                  }
                  onChange={(e) => {
                    const v = e.target.value === "" ? null : Number(e.target.value);
                    if (v === null || v >= selectedSpot.umbraRadius)
                      act({ type: "update-spot", id: selectedSpot.id, patch: { penumbraRadius: v } });
                  }}
                  className="w-24 rounded border border-ink-200 px-1 py-0.5"
                />
                <span>Position</span>
                <span>
                  {selectedSpotMeasure?.position
                    ? `Lat ${formatSigned(selectedSpotMeasure.position.lat)}, CMD ${formatSigned(selectedSpotMeasure.position.lon)}`
                    : selectedSpotMeasure?.outsideDisk
                      ? "Outside the disk"
                      : "Orient the disk to measure"}
                </span>
                <span>Area</span>
                <span>
                  {selectedSpot.area ? (
                    <>
                      {selectedSpotMeasure?.areaMsh !== null && selectedSpotMeasure?.areaMsh !== undefined
                        ? `${Math.round(selectedSpotMeasure.areaMsh)} MSH (corrected for foreshortening)`
                        : "drawn"}{" "}
                      <button
                        type="button"
                        className="underline"
                        onClick={() =>
                          act({ type: "set-area", target: { kind: "spot", id: selectedSpot.id }, area: null })
                        }
                      >
                        remove
                      </button>
                    </>
                  ) : (
                    "none: use the Area tool (A)"
                  )}
                </span>
              </div>
            ) : null}
            <div className="mt-3 flex flex-wrap items-center gap-2 border-t border-ink-100 pt-2">
              <Button type="button" variant="secondary" className="px-2 py-1 text-xs" onClick={suggest}>
                Suggest groups
              </Button>
              <label className="flex items-center gap-1 text-xs text-ink-700">
                within
                <input
                  type="number"
                  min={1}
                  max={20}
                  step={0.5}
                  value={linkDistanceDeg}
                  onChange={(e) =>
                    setLinkDistanceDeg(
                      Math.min(20, Math.max(1, Number(e.target.value) || DEFAULT_LINK_DISTANCE_DEG)),
                    )
                  }
                  className="w-14 rounded border border-ink-200 px-1 py-0.5"
                  aria-label="Link distance for suggested groups, degrees"
                />
                °
              </label>
              {suggestion ? (
                <>
                  <Button type="button" className="px-2 py-1 text-xs" onClick={acceptSuggestion}>
                    Accept suggested groups
                  </Button>
                  <Button
                    type="button"
                    variant="quiet"
                    className="px-2 py-1 text-xs"
                    onClick={() => setSuggestion(null)}
                  >
                    Dismiss
                  </Button>
                </>
              ) : null}
            </div>
          </section>

          <section className="rounded-lg border border-ink-100 bg-white p-3 text-sm">
            <div className="flex items-center justify-between">
              <h2 className="font-semibold text-ink-900">Groups</h2>
              {measurement.groups.length > 1 ? (
                <button
                  type="button"
                  className="text-xs text-corona-700 underline"
                  onClick={renumberEastToWest}
                >
                  Number east to west
                </button>
              ) : null}
            </div>
            <div className="mt-2">
              <GroupPanel
                groups={document.groups}
                measured={measurement.groups}
                selectedGroupId={selectedGroupId}
                onSelectGroup={selectGroup}
                dispatch={act}
              />
            </div>
            {problemsToShow.length > 0 ? (
              <ul className="mt-2 list-disc pl-5 text-xs text-caution-700" data-testid="tracing-problems">
                {problemsToShow.slice(0, 6).map((p) => (
                  <li key={`${p.path}-${p.message}`}>{p.message}</li>
                ))}
              </ul>
            ) : null}
          </section>

          <section className="rounded-lg border border-ink-100 bg-white p-3 text-sm">
            <h2 className="font-semibold text-ink-900">Counts for the {utDate} observation</h2>
            <div className="mt-2">
              <CountsPanel
                tracingCounts={measurement.counts}
                storedCounts={storedCounts}
                draft={countDraft}
                onChange={(key, value) =>
                  setCountDraft((d) => ({ ...(d ?? countsToDraft(measurement.counts)), [key]: value }))
                }
                onReset={() => {
                  setCountDraft(null);
                  setCountErrors({});
                }}
                errors={countErrors}
              />
            </div>
            <div className="mt-3 flex flex-wrap items-center gap-3">
              <Button type="button" onClick={() => void save()} disabled={saving}>
                {saving ? "Saving…" : "Save tracing"}
              </Button>
              <span className="text-xs text-ink-600" data-testid="save-state">
                {unsaved ? "Unsaved changes" : revision > 0 ? `Saved, revision ${revision}` : "Not saved yet"}
              </span>
            </div>
            <p className="mt-2 text-xs">
              <Link href={`/logbook/${observationId}`} className="text-corona-700 underline">
                Back to the observation
              </Link>
            </p>
          </section>
        </aside>
      </div>
    </div>
  );
}
