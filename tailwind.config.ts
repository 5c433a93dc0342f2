import type { Config } from "tailwindcss";

/**
 * Design tokens: warm copper accent on slate neutrals, a sun-yellow highlight used sparingly,
 * and the four finding levels (each always shown with an icon and a word, never colour alone).
 * Loaded from app/globals.css through `@config`.
 */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        copper: {
          50: "#fbf4ef",
          100: "#f5e3d6",
          200: "#ebc4a9",
          300: "#dd9e74",
          400: "#cf7c4b",
          500: "#b9622f",
          600: "#9d4f25",
          700: "#7e3f1f",
          800: "#62321b",
          900: "#4a2716",
        },
        sun: { 300: "#fcd865", 400: "#f8c537", 500: "#e9ab12" },
        level: {
          ok: "#1f7a4d",
          "ok-bg": "#e7f5ee",
          note: "#2f5f8a",
          "note-bg": "#e8f0f8",
          fix: "#9a5b00",
          "fix-bg": "#fdf1de",
          stop: "#b42318",
          "stop-bg": "#fdeceb",
        },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "ui-sans-serif", "system-ui", "sans-serif"],
      },
      borderRadius: { card: "0.75rem" },
    },
  },
};

export default config;
