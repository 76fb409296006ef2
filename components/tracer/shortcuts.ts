/** Tools of the Disk tracer, in the order the toolbar shows them. */
export const TOOLS = [
  {
    id: "select",
    label: "Select",
    key: "v",
    hint: "Click a spot to select it (Shift adds), drag to move, drag on empty card to lasso.",
  },
  { id: "pan", label: "Pan", key: "h", hint: "Drag to move the view. The mouse wheel or a pinch zooms." },
  { id: "disk", label: "Drag disk", key: "d", hint: "Press on the disk centre and drag out to the limb." },
  {
    id: "limb",
    label: "Limb points",
    key: "l",
    hint: "Click three or more points on the limb, then Fit circle (Enter).",
  },
  {
    id: "north",
    label: "North mark",
    key: "n",
    hint: "Click toward celestial north, e.g. where you marked N on the card.",
  },
  {
    id: "drift",
    label: "Drift line",
    key: "w",
    hint: "With the drive off, drag along the way the image drifts: that is west.",
  },
  {
    id: "spot",
    label: "Spot",
    key: "s",
    hint: "Click to place an umbra; press and drag out to give it a penumbra.",
  },
  {
    id: "area",
    label: "Area",
    key: "a",
    hint: "Select one spot or group, then drag a box around it to measure its area.",
  },
] as const;

export type ToolId = (typeof TOOLS)[number]["id"];

/** Shown in the tracer's help panel; the key handler in disk-tracer.tsx follows this list. */
export const SHORTCUTS: Array<{ keys: string; does: string }> = [
  ...TOOLS.map((t) => ({ keys: t.key.toUpperCase(), does: `${t.label} tool` })),
  { keys: "G", does: "Group the selected spots" },
  { keys: "Shift+G", does: "Suggest groups" },
  { keys: "U", does: "Take the selected spots out of their group" },
  { keys: "Delete / Backspace", does: "Delete the selected spots" },
  { keys: "Arrow keys", does: "Nudge the selected spots (Shift: ten times further)" },
  { keys: "Enter", does: "Fit the circle to the limb points" },
  { keys: "M", does: "Mirrored image on or off" },
  { keys: "T", does: "Heliographic grid on or off" },
  { keys: "Ctrl+Z", does: "Undo" },
  { keys: "Ctrl+Shift+Z / Ctrl+Y", does: "Redo" },
  { keys: "+ / −", does: "Zoom in / out" },
  { keys: "0", does: "Fit the drawing to the view" },
  { keys: "Ctrl+S", does: "Save" },
  { keys: "Esc", does: "Cancel, clear the selection" },
];
