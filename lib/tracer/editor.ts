/**
 * The tracer's editing model: every change to a tracing is an action on a
 * plain document, and the history keeps whole documents (they are small and
 * immutable), so undo and redo are exact. Framework-free: the React tracer
 * wraps it in useReducer, the tests drive it directly. Ids come in with the
 * actions so the reducer stays pure.
 */

import type {
  TracingDisk,
  TracingDocument,
  TracingEllipse,
  TracingGroup,
  TracingOrientation,
  TracingSpot,
} from "@/lib/validation/tracing";

/** Enough for a long session; older steps fall off the end. */
export const HISTORY_LIMIT = 200;

export type EditorState = {
  document: TracingDocument;
  past: TracingDocument[];
  future: TracingDocument[];
  /** The document as last saved (or loaded), to tell whether there are unsaved changes. */
  saved: TracingDocument;
};

export type AreaTarget = { kind: "spot"; id: string } | { kind: "group"; id: string };

export type EditorAction =
  | { type: "set-disk"; disk: TracingDisk | null }
  | { type: "set-orientation"; orientation: TracingOrientation | null }
  | { type: "set-mirrored"; mirrored: boolean }
  | { type: "add-spot"; spot: Omit<TracingSpot, "area"> & { area?: TracingEllipse | null } }
  | { type: "move-spots"; ids: string[]; dx: number; dy: number }
  | { type: "update-spot"; id: string; patch: Partial<Pick<TracingSpot, "umbraRadius" | "penumbraRadius">> }
  | { type: "delete-spots"; ids: string[] }
  | { type: "group-spots"; ids: string[]; newGroupId: string }
  | { type: "ungroup-spots"; ids: string[] }
  | { type: "apply-groups"; clusters: Array<{ spotIds: string[]; newGroupId: string }> }
  | {
      type: "update-group";
      id: string;
      patch: Partial<Pick<TracingGroup, "number" | "zurichClass" | "mcintoshClass">>;
    }
  | { type: "delete-group"; id: string }
  | { type: "renumber-groups"; orderedIds: string[] }
  | { type: "set-area"; target: AreaTarget; area: TracingEllipse | null }
  | { type: "set-background"; patch: Partial<TracingDocument["background"]> }
  | { type: "undo" }
  | { type: "redo" }
  | { type: "load"; document: TracingDocument }
  | { type: "mark-saved" };

export function createEditorState({ document }: { document: TracingDocument }): EditorState {
  return { document, past: [], future: [], saved: document };
}

export function canUndo(state: EditorState): boolean {
  return state.past.length > 0;
}

export function canRedo(state: EditorState): boolean {
  return state.future.length > 0;
}

export function hasUnsavedChanges(state: EditorState): boolean {
  return state.document !== state.saved;
}

/** The next free group number (numbers run 1, 2, 3… within the day). */
export function nextGroupNumber(groups: TracingGroup[]): number {
  return groups.reduce((max, g) => Math.max(max, g.number), 0) + 1;
}

/** Drops groups left without spots, so the document never keeps an empty group by accident. */
function dropEmptyGroups(document: TracingDocument): TracingDocument {
  const used = new Set(document.spots.map((s) => s.groupId));
  const groups = document.groups.filter((g) => used.has(g.id));
  return groups.length === document.groups.length ? document : { ...document, groups };
}

function applyChange(document: TracingDocument, action: EditorAction): TracingDocument {
  switch (action.type) {
    case "set-disk":
      return { ...document, disk: action.disk };
    case "set-orientation":
      return { ...document, orientation: action.orientation };
    case "set-mirrored":
      return document.orientation
        ? { ...document, orientation: { ...document.orientation, mirrored: action.mirrored } }
        : document;
    case "add-spot":
      return { ...document, spots: [...document.spots, { area: null, ...action.spot }] };
    case "move-spots": {
      if (action.dx === 0 && action.dy === 0) return document;
      const ids = new Set(action.ids);
      const shift = <T extends { cx: number; cy: number }>(e: T): T => ({
        ...e,
        cx: e.cx + action.dx,
        cy: e.cy + action.dy,
      });
      return {
        ...document,
        spots: document.spots.map((s) =>
          ids.has(s.id)
            ? { ...s, x: s.x + action.dx, y: s.y + action.dy, area: s.area ? shift(s.area) : null }
            : s,
        ),
      };
    }
    case "update-spot":
      return {
        ...document,
        spots: document.spots.map((s) => (s.id === action.id ? { ...s, ...action.patch } : s)),
      };
    case "delete-spots": {
      const ids = new Set(action.ids);
      return dropEmptyGroups({ ...document, spots: document.spots.filter((s) => !ids.has(s.id)) });
    }
    case "group-spots": {
      if (action.ids.length === 0) return document;
      const ids = new Set(action.ids);
      const group: TracingGroup = {
        id: action.newGroupId,
        number: nextGroupNumber(document.groups),
        zurichClass: null,
        mcintoshClass: null,
        area: null,
      };
      return dropEmptyGroups({
        ...document,
        groups: [...document.groups, group],
        spots: document.spots.map((s) => (ids.has(s.id) ? { ...s, groupId: group.id } : s)),
      });
    }
    case "ungroup-spots": {
      const ids = new Set(action.ids);
      return dropEmptyGroups({
        ...document,
        spots: document.spots.map((s) => (ids.has(s.id) ? { ...s, groupId: null } : s)),
      });
    }
    case "apply-groups": {
      let next = document;
      for (const cluster of action.clusters)
        next = applyChange(next, {
          type: "group-spots",
          ids: cluster.spotIds,
          newGroupId: cluster.newGroupId,
        });
      return next;
    }
    case "update-group":
      return {
        ...document,
        groups: document.groups.map((g) => (g.id === action.id ? { ...g, ...action.patch } : g)),
      };
    case "delete-group":
      return {
        ...document,
        groups: document.groups.filter((g) => g.id !== action.id),
        spots: document.spots.map((s) => (s.groupId === action.id ? { ...s, groupId: null } : s)),
      };
    case "renumber-groups": {
      const order = new Map(action.orderedIds.map((id, i) => [id, i + 1]));
      let extra = action.orderedIds.length;
      return {
        ...document,
        groups: document.groups.map((g) => ({ ...g, number: order.get(g.id) ?? ++extra })),
      };
    }
    case "set-area":
      if (action.target.kind === "spot") {
        const { id } = action.target;
        return {
          ...document,
          spots: document.spots.map((s) => (s.id === id ? { ...s, area: action.area } : s)),
        };
      } else {
        const { id } = action.target;
        return {
          ...document,
          groups: document.groups.map((g) => (g.id === id ? { ...g, area: action.area } : g)),
        };
      }
    case "set-background":
      return { ...document, background: { ...document.background, ...action.patch } };
    default:
      return document;
  }
}

export function editorReducer(state: EditorState, action: EditorAction): EditorState {
  switch (action.type) {
    case "undo": {
      const previous = state.past[state.past.length - 1];
      if (!previous) return state;
      return {
        ...state,
        document: previous,
        past: state.past.slice(0, -1),
        future: [state.document, ...state.future],
      };
    }
    case "redo": {
      const [next, ...rest] = state.future;
      if (!next) return state;
      return { ...state, document: next, past: [...state.past, state.document], future: rest };
    }
    case "load":
      return createEditorState({ document: action.document });
    case "mark-saved":
      return { ...state, saved: state.document };
    default: {
      const document = applyChange(state.document, action);
      if (document === state.document) return state;
      const past = [...state.past, state.document];
      return {
        ...state,
        document,
        past: past.length > HISTORY_LIMIT ? past.slice(-HISTORY_LIMIT) : past,
        future: [],
      };
    }
  }
}
