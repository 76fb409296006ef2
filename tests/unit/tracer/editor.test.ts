import { describe, expect, it } from "vitest";

import {
  canRedo,
  canUndo,
  createEditorState,
  editorReducer,
  hasUnsavedChanges,
  HISTORY_LIMIT,
  type EditorAction,
} from "@/lib/tracer/editor";
import { createEmptyTracing } from "@/lib/validation/tracing";

const spot = (id: string, x: number, y: number) => ({
  id,
  x,
  y,
  umbraRadius: 4,
  penumbraRadius: null,
  groupId: null,
});

function run(actions: EditorAction[]) {
  return actions.reduce(editorReducer, createEditorState({ document: createEmptyTracing() }));
}

describe("the tracer's editing model", () => {
  it("adds, moves and deletes spots", () => {
    const state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      { type: "add-spot", spot: spot("b", 20, 20) },
      { type: "move-spots", ids: ["a"], dx: 5, dy: -3 },
      { type: "delete-spots", ids: ["b"] },
    ]);
    expect(state.document.spots).toEqual([{ ...spot("a", 15, 7), area: null }]);
  });

  it("undoes and redoes exactly, and a new change clears the redo list", () => {
    let state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      { type: "move-spots", ids: ["a"], dx: 5, dy: 0 },
    ]);
    const moved = state.document;
    state = editorReducer(state, { type: "undo" });
    expect(state.document.spots[0]!.x).toBe(10);
    expect(canRedo(state)).toBe(true);
    state = editorReducer(state, { type: "redo" });
    expect(state.document).toBe(moved);
    state = editorReducer(state, { type: "undo" });
    state = editorReducer(state, { type: "add-spot", spot: spot("b", 1, 1) });
    expect(canRedo(state)).toBe(false);
    state = editorReducer(state, { type: "undo" });
    state = editorReducer(state, { type: "undo" });
    expect(state.document.spots).toEqual([]);
    expect(canUndo(state)).toBe(false);
    expect(editorReducer(state, { type: "undo" })).toBe(state);
  });

  it("groups spots under the next free number and drops groups left empty", () => {
    let state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      { type: "add-spot", spot: spot("b", 20, 20) },
      { type: "add-spot", spot: spot("c", 90, 90) },
      { type: "group-spots", ids: ["a", "b"], newGroupId: "g1" },
      { type: "group-spots", ids: ["c"], newGroupId: "g2" },
    ]);
    expect(state.document.groups.map((g) => [g.id, g.number])).toEqual([
      ["g1", 1],
      ["g2", 2],
    ]);
    state = editorReducer(state, { type: "group-spots", ids: ["c", "b"], newGroupId: "g3" });
    // g2 lost its only spot and is gone; g3 takes the next number.
    expect(state.document.groups.map((g) => [g.id, g.number])).toEqual([
      ["g1", 1],
      ["g3", 3],
    ]);
    state = editorReducer(state, { type: "ungroup-spots", ids: ["a"] });
    expect(state.document.spots.find((s) => s.id === "a")!.groupId).toBeNull();
  });

  it("applies suggested groups in one undoable step", () => {
    let state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      { type: "add-spot", spot: spot("b", 20, 20) },
    ]);
    state = editorReducer(state, {
      type: "apply-groups",
      clusters: [
        { spotIds: ["a"], newGroupId: "g1" },
        { spotIds: ["b"], newGroupId: "g2" },
      ],
    });
    expect(state.document.groups).toHaveLength(2);
    state = editorReducer(state, { type: "undo" });
    expect(state.document.groups).toHaveLength(0);
  });

  it("moves a spot's area ellipse with it", () => {
    const state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      {
        type: "set-area",
        target: { kind: "spot", id: "a" },
        area: { cx: 10, cy: 10, rx: 3, ry: 2, rotationDeg: 0 },
      },
      { type: "move-spots", ids: ["a"], dx: 1, dy: 2 },
    ]);
    expect(state.document.spots[0]!.area).toEqual({ cx: 11, cy: 12, rx: 3, ry: 2, rotationDeg: 0 });
  });

  it("renumbers groups in the order given", () => {
    const state = run([
      { type: "add-spot", spot: spot("a", 10, 10) },
      { type: "add-spot", spot: spot("b", 20, 20) },
      { type: "group-spots", ids: ["a"], newGroupId: "g1" },
      { type: "group-spots", ids: ["b"], newGroupId: "g2" },
      { type: "renumber-groups", orderedIds: ["g2", "g1"] },
    ]);
    expect(state.document.groups.map((g) => [g.id, g.number])).toEqual([
      ["g1", 2],
      ["g2", 1],
    ]);
  });

  it("knows when there are unsaved changes", () => {
    let state = run([{ type: "add-spot", spot: spot("a", 10, 10) }]);
    expect(hasUnsavedChanges(state)).toBe(true);
    state = editorReducer(state, { type: "mark-saved" });
    expect(hasUnsavedChanges(state)).toBe(false);
  });

  it("keeps a bounded history", () => {
    const actions: EditorAction[] = Array.from({ length: HISTORY_LIMIT + 20 }, (_, i) => ({
      type: "add-spot",
      spot: spot(`s${i}`, i, i),
    }));
    expect(run(actions).past).toHaveLength(HISTORY_LIMIT);
  });
});
