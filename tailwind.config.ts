import type { Config } from "tailwindcss";

// Heliotally's own palette: warm "photosphere" ambers for actions, deep
// "chromosphere" inks for text, and a quiet paper background that reads well
// when printed next to a projection card.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        corona: {
          50: "#fffaf0",
          100: "#fff1d6",
          200: "#ffe0a3",
          300: "#ffc866",
          400: "#ffad33",
          500: "#f59311",
          600: "#d97206",
          700: "#b35309",
          800: "#8f420e",
          900: "#75380f",
        },
        ink: {
          50: "#f6f6f9",
          100: "#ececf2",
          200: "#d5d5e2",
          300: "#b0b1c8",
          400: "#8587a9",
          500: "#65678e",
          600: "#505175",
          700: "#42435f",
          800: "#393a50",
          900: "#232333",
          950: "#17172a",
        },
        umbra: "#2b1d3a",
        paper: "#fcfbf7",
        caution: { 50: "#fff4f2", 200: "#ffc9bd", 700: "#a3290f", 800: "#86230f" },
        meadow: { 50: "#f0fbf4", 200: "#b9ecc9", 700: "#1c6e3d" },
      },
      fontFamily: {
        sans: ["'Inter Variable'", "ui-sans-serif", "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;
