// Shared theme tokens, attached to globals.css with @config. Colours are CSS variables so the
// light and dim themes switch with one attribute on <html>.
import type { Config } from "tailwindcss";

const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        bg: "var(--c-bg)",
        panel: "var(--c-panel)",
        sunk: "var(--c-sunk)",
        ink: "var(--c-ink)",
        muted: "var(--c-muted)",
        line: "var(--c-line)",
        accent: "var(--c-accent)",
        "accent-ink": "var(--c-accent-ink)",
        ok: "var(--c-ok)",
        warn: "var(--c-warn)",
        danger: "var(--c-danger)",
        "danger-ink": "var(--c-danger-ink)",
      },
      minHeight: { touch: "44px" },
      minWidth: { touch: "44px" },
    },
  },
};

export default config;
