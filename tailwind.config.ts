import type { Config } from "tailwindcss";

// Rustline's palette: iron greys, a verdigris accent, and rust reserved for rust and warnings.
export default {
  theme: {
    extend: {
      colors: {
        iron: { 50: "#f5f6f7", 100: "#e8eaec", 200: "#cfd3d7", 300: "#aab1b8", 400: "#7f8893", 500: "#5f6873", 600: "#4a525c", 700: "#3a4049", 800: "#282d33", 900: "#1a1d21", 950: "#101215" },
        verdigris: { 50: "#effaf7", 100: "#d2f1e9", 200: "#a6e2d3", 300: "#6ecbb7", 400: "#3faf99", 500: "#25937f", 600: "#1b7667", 700: "#195f54", 800: "#174c45", 900: "#153f3a" },
        rust: { 50: "#fdf4ed", 100: "#fae4d2", 200: "#f3c4a0", 300: "#eb9c66", 400: "#e07638", 500: "#c95b1f", 600: "#a84618", 700: "#863717", 800: "#6b2e18", 900: "#572716" },
      },
      fontFamily: {
        sans: ["var(--font-plex-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-plex-mono)", "ui-monospace", "monospace"],
      },
    },
  },
} satisfies Config;
