import type { Config } from "tailwindcss";

// Every colour is a CSS variable holding RGB channels (see app/globals.css), so one
// class such as `bg-paper` flips between light and dark without `dark:` variants,
// and opacity modifiers like `bg-oil/10` still work.
const token = (name: string) => `rgb(var(--${name}) / <alpha-value>)`;

// Each hue has three steps so pairs are always known to pass contrast:
//   DEFAULT – text/icons on paper, surface or soft; also solid fills
//   soft    – tinted background behind DEFAULT text or plain ink
//   on      – text/icons placed on a solid DEFAULT fill
const hue = (name: string) => ({
  DEFAULT: token(name),
  soft: token(`${name}-soft`),
  on: token(`on-${name}`),
});

const config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}", "./lib/**/*.{ts,tsx}"],
  // Follows the phone's own light/dark setting; the variables switch under the same media query.
  darkMode: "media",
  theme: {
    extend: {
      colors: {
        // Neutrals: warm, like shop paperwork under workshop light.
        paper: token("paper"), // page background
        surface: token("surface"), // cards, inputs, raised panels
        sunken: token("sunken"), // table heads, skeletons, wells
        ink: {
          DEFAULT: token("ink"), // body text
          muted: token("ink-muted"), // secondary text, hints
        },
        line: {
          DEFAULT: token("line"), // decorative dividers only
          strong: token("line-strong"), // control borders (≥ 3:1 against surfaces)
        },
        oil: hue("oil"), // primary: deep blue-green of fresh oil
        brass: hue("brass"), // accent and focus ring: warm brass fittings
        rust: hue("rust"), // danger, destructive actions, errors
        moss: hue("moss"), // done, OK, success
        signal: hue("signal"), // amber warnings and safety cautions
        dusk: hue("dusk"), // calm indigo for "thinking" states such as diagnosing
      },
      fontFamily: {
        sans: [
          "var(--font-archivo)",
          "ui-sans-serif",
          "system-ui",
          "-apple-system",
          "Segoe UI",
          "Roboto",
          "Helvetica Neue",
          "Arial",
          "sans-serif",
        ],
      },
      // 44 px: the smallest comfortable target for a gloved or greasy thumb.
      minHeight: { tap: "2.75rem" },
      minWidth: { tap: "2.75rem" },
      spacing: { tap: "2.75rem" },
    },
  },
  plugins: [],
} satisfies Config;

export default config;
