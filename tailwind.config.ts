import type { Config } from "tailwindcss";

// Palette drawn from old sets: cream dial glass, bakelite, walnut cabinets, a valve-glow ember accent.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        dial: { DEFAULT: "#f6f1e7", deep: "#ece3d2", rule: "#d9cdb8" },
        bakelite: { DEFAULT: "#2a2320", soft: "#4a3f38", muted: "#6b5f55" },
        walnut: { DEFAULT: "#5b3a29", light: "#7a5440" },
        ember: { DEFAULT: "#9c3d1c", dark: "#7c2f14", light: "#f3e0d5" },
        brass: { DEFAULT: "#8a6a22", light: "#efe4c6" },
        pass: { DEFAULT: "#2f6b3a", light: "#e1efe1" },
        fail: { DEFAULT: "#a11d1d", light: "#f7e0dd" },
        pending: { DEFAULT: "#6b5f55", light: "#ece7df" },
      },
      fontFamily: {
        sans: ["var(--font-plex-sans)", "system-ui", "sans-serif"],
        serif: ["var(--font-serif)", "Georgia", "serif"],
        mono: ["var(--font-plex-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
      },
      borderRadius: { card: "0.375rem" },
      maxWidth: { page: "72rem", prose: "42rem" },
    },
  },
};

export default config;
