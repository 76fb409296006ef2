/** Chart colours from the Heliotally palette (tailwind.config.ts), chosen to stay apart when printed in grey. */
export const CHART_COLOURS = {
  daily: "#b0b1c8",
  monthly: "#d97206",
  smoothed: "#2b1d3a",
  north: "#1c6e3d",
  south: "#a3290f",
  observer: "#f59311",
  network: "#393a50",
} as const;
