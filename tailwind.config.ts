import type { Config } from "tailwindcss";

// Railwise palette: graphite ink on a cool paper ground; signal colours are reserved for
// plots and status (input = indigo, output = copper, rails = slate, thresholds = moss).
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: "#1d2430", soft: "#3b4556", mute: "#6b7587", faint: "#9aa3b2" },
        paper: { DEFAULT: "#f6f7f4", card: "#ffffff", sunk: "#eceee8", line: "#d9ddd3" },
        copper: { DEFAULT: "#b5562a", soft: "#f3e1d6", deep: "#8a3d1a" },
        indigo: { DEFAULT: "#3b4fa8", soft: "#e0e4f6" },
        moss: { DEFAULT: "#4d7a3a", soft: "#e2eddb" },
        alert: { DEFAULT: "#b4232f", soft: "#f8dfe1" },
        caution: { DEFAULT: "#a86b00", soft: "#fbefd3" },
      },
      fontFamily: {
        sans: ["var(--font-plex)", "system-ui", "sans-serif"],
        mono: ["var(--font-jb)", "ui-monospace", "monospace"],
      },
    },
  },
};

export default config;
