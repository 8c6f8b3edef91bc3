// Our palette (tailwind.config.ts / app/globals.css, light values) as plain hex for e-mail
// clients, which know neither CSS variables nor our font; inline styles only.
export const mailColors = {
  paper: "#F5F2EC",
  surface: "#FFFDF9",
  sunken: "#EAE5DC",
  ink: "#1E1B17",
  inkMuted: "#595249",
  line: "#D8D1C5",
  oil: "#0D5257",
  onOil: "#FFFFFF",
  moss: "#2F6A2B",
  signal: "#8F4F00",
} as const;

export const mailFont = "-apple-system, 'Segoe UI', Roboto, Helvetica, Arial, sans-serif";
