import type { Config } from "tailwindcss";

// Cairn's design tokens (see DESIGN.md "Names and look").
const config: Config = {
  content: ["./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: "#FAF8F4",
        ink: "#1F2421",
        lichen: { DEFAULT: "#3E6B5C", dark: "#2F5346", light: "#E3ECE8" },
        ochre: { DEFAULT: "#B7802A", dark: "#8A5F1C", light: "#F6EBD8" },
        brick: { DEFAULT: "#A4412E", dark: "#7E3021", light: "#F5E1DC" },
        slate: { DEFAULT: "#3D5A80", dark: "#2C4260", light: "#E1E8F1" },
        rule: "#DAD5CB",
        muted: "#5B625E",
      },
      fontFamily: {
        sans: ["var(--font-text)", "system-ui", "sans-serif"],
        mono: ["var(--font-figures)", "ui-monospace", "monospace"],
      },
    },
  },
};

export default config;
