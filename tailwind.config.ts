// Halflight's design tokens. Loaded by app/globals.css through `@config`, so these are the classes the app really has.
import type { Config } from "tailwindcss";

const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        // Neutrals: a cool "paper and ink" ramp; ink-900 on paper passes WCAG AAA for body text.
        paper: { DEFAULT: "#f7f6f2", raised: "#ffffff", sunk: "#eceae3" },
        ink: {
          900: "#1b2230",
          700: "#3a4457",
          500: "#5d687c",
          300: "#a9b1bf",
          100: "#dde1e8",
        },
        // One accent: a deep teal taken from a quartz cell seen edge-on.
        quartz: { 700: "#0f5c63", 600: "#13717a", 500: "#1a8a94", 100: "#d7eef0" },
        // States always pair a colour with words (UI.md): pass / caution / fault.
        pass: { 700: "#1f6b3a", 100: "#dcf0e2" },
        caution: { 700: "#7a4d00", 100: "#fbefd2" },
        fault: { 700: "#9b1c1c", 100: "#fbe0e0" },
      },
      fontFamily: {
        sans: ["var(--hl-font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--hl-font-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        // A 1.2 type scale from a 15 px body.
        xs: ["0.75rem", { lineHeight: "1.1rem" }],
        sm: ["0.8125rem", { lineHeight: "1.25rem" }],
        base: ["0.9375rem", { lineHeight: "1.5rem" }],
        lg: ["1.125rem", { lineHeight: "1.65rem" }],
        xl: ["1.35rem", { lineHeight: "1.9rem" }],
        "2xl": ["1.62rem", { lineHeight: "2.1rem" }],
        "3xl": ["1.94rem", { lineHeight: "2.4rem" }],
      },
      spacing: {
        gutter: "1.5rem",
        rail: "15rem",
      },
      borderRadius: { cell: "0.3rem" },
      boxShadow: { lift: "0 1px 2px rgb(27 34 48 / 0.08), 0 4px 12px rgb(27 34 48 / 0.06)" },
    },
  },
};

export default config;
