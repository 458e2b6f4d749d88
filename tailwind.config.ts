import type { Config } from "tailwindcss";

// Steamlane's own look: warm paper, deep lagoon ink for structure, ember for the one thing to act on.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: "#f4f2ec",
        surface: "#ffffff",
        ink: { DEFAULT: "#1d2a2f", soft: "#3b4a4f" },
        muted: "#5c6863",
        line: { DEFAULT: "#ddd8cc", strong: "#c3bcab" },
        lagoon: {
          50: "#eaf4f3",
          100: "#d2e8e6",
          200: "#a8d1cd",
          300: "#74b3ae",
          400: "#3f928d",
          500: "#1f7f82",
          600: "#147077",
          700: "#0f5e63",
          800: "#0c4a4e",
          900: "#09383b",
        },
        ember: { 50: "#fdf2e8", 100: "#fbe3cd", 500: "#d4731f", 600: "#b95f14", 700: "#964b0f" },
        ok: { 50: "#edf6ee", 600: "#2f7a3a", 700: "#24602d" },
        warn: { 50: "#fdf5e3", 600: "#9a6200", 700: "#7a4d00" },
        danger: { 50: "#fcecea", 600: "#b3261e", 700: "#8f1d17" },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "ui-sans-serif", "system-ui", "sans-serif"],
      },
      borderRadius: { card: "14px" },
      boxShadow: { card: "0 1px 0 rgba(29, 42, 47, 0.04), 0 1px 3px rgba(29, 42, 47, 0.08)" },
    },
  },
};

export default config;
