import type { Config } from "tailwindcss";

// Blockyard's own palette: foam whites and bead greys, a deep "slate-pine" ink,
// a teal for actions and a hot-wire orange kept for cautions and cut lines.
// Contrast (WCAG 2.1 AA, read at the machine): every text colour is at least 4.5:1 on paper.sunk and
// on its own `light` tint; bead.strong (control borders) at least 3:1 on paper and paper.raised.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: "#1c2a2e", soft: "#3d4f54", faint: "#58676b" },
        paper: { DEFAULT: "#f7f5ef", raised: "#ffffff", sunk: "#eeeae0" },
        bead: { DEFAULT: "#ddd6c6", strong: "#8a806f" },
        kerf: { DEFAULT: "#1f6c75", dark: "#16525a", light: "#d7ecee" },
        wire: { DEFAULT: "#b04418", light: "#fbe6da" },
        moss: { DEFAULT: "#326e41", light: "#e0efe3" },
        ember: { DEFAULT: "#a8322a", light: "#f7e0dd" },
        ochre: { DEFAULT: "#8a600c", light: "#f6ecd2" },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "system-ui", "sans-serif"],
      },
      fontSize: {
        // A calm scale that stays legible at arm's length on a tablet by the machine: nothing under
        // 15 px, so hints, captions and badges (xs) differ from body text (sm) by colour and weight.
        xs: ["0.9375rem", { lineHeight: "1.3rem" }],
        sm: ["0.9375rem", { lineHeight: "1.35rem" }],
        base: ["1.0625rem", { lineHeight: "1.6rem" }],
        lg: ["1.25rem", { lineHeight: "1.75rem" }],
        xl: ["1.5rem", { lineHeight: "2rem" }],
        "2xl": ["1.875rem", { lineHeight: "2.35rem" }],
      },
      borderRadius: { card: "0.625rem" },
      boxShadow: { card: "0 1px 0 rgba(28,42,46,0.06), 0 1px 3px rgba(28,42,46,0.08)" },
    },
  },
};

export default config;
