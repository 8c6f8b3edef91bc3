// The stylesheet the shops' public pages carry inside their HTML (app/(public)/layout.tsx). A story
// page is opened from a link on a phone, often on a slow line: a <link rel="stylesheet"> costs it a
// whole extra request before anything paints (about 2 s under "Slow 3G"), so these pages inline
// their styles instead. The app's own areas keep the linked, cached stylesheet (app/app-styles.tsx).
//
// The app's stylesheet (app/globals.css through Tailwind with tailwind.config.ts, minified by Tailwind's
// CLI), but with only the classes the public pages can use: Tailwind scans just the files those pages
// import, found by esbuild from the public area's layout and pages (every bit of text is inlined on
// every visit, so the staff screens' classes stay out). Plus the font: the app gets Archivo from
// next/font/local, whose CSS only comes as a linked file, so here the same files (public/fonts) are
// declared by hand, with next/font's metric-matched Arial fallback so text doesn't jump when the
// face arrives.
//
// next.config.mjs calls this from `compiler.runAfterProductionCompile` (every build: npm start's, the
// tests', the bench's, the cluster's); `next dev` makes it on first use (lib/server/public-css.ts).
import { execFile } from "node:child_process";
import { mkdir, readdir, readFile, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";

/** Where a build keeps it, beside its other output. */
export const PUBLIC_CSS_FILE = "public-pages.css";

// font-display: swap, as next/font is set (app/app-styles.tsx): text shows at once in the fallback.
// The fallback's overrides are the ones next/font computes for this font against Arial.
const FONT_CSS = [
  `@font-face{font-family:Archivo;src:url(/fonts/archivo-wght.woff2) format("woff2");font-display:swap;font-weight:100 900;font-style:normal}`,
  `@font-face{font-family:Archivo;src:url(/fonts/archivo-wght-italic.woff2) format("woff2");font-display:swap;font-weight:100 900;font-style:italic}`,
  `@font-face{font-family:"Archivo Fallback";src:local(Arial);ascent-override:85.41%;descent-override:20.43%;line-gap-override:0%;size-adjust:102.8%}`,
  `:root{--font-archivo:Archivo,"Archivo Fallback"}`,
].join("");

/** Our own source files the public area's layout and pages import, directly or not (absolute paths). */
export async function publicAreaFiles(projectDir) {
  const { build } = await import("esbuild");
  const area = path.join(projectDir, "app", "(public)");
  const entries = (await readdir(area, { recursive: true })).filter((f) => /(^|[\\/])(layout|page)\.tsx$/.test(f)).map((f) => path.join(area, f));
  // The root layout (the skip link) is drawn on these pages too.
  entries.push(path.join(projectDir, "app", "layout.tsx"));
  const result = await build({
    entryPoints: entries,
    absWorkingDir: projectDir,
    bundle: true,
    write: false,
    metafile: true,
    outdir: path.join(os.tmpdir(), "benchside-public-css-scan"),
    platform: "node",
    format: "esm",
    jsx: "automatic",
    packages: "external", // npm packages bring no classes of ours
    loader: { ".css": "empty", ".png": "empty", ".svg": "empty", ".woff2": "empty", ".ttf": "empty" },
    logLevel: "silent",
  });
  return Object.keys(result.metafile.inputs)
    .filter((f) => /\.(tsx?|jsx?|mjs)$/.test(f) && !f.includes("node_modules"))
    .map((f) => path.resolve(projectDir, f));
}

/** Compiles the public pages' stylesheet and writes it to `<distDir>/public-pages.css`; returns the CSS. */
export async function buildPublicCss({ projectDir, distDir }) {
  const stamp = `${process.pid}-${Date.now()}`;
  const out = path.join(os.tmpdir(), `benchside-public-css-${stamp}.css`);
  const config = path.join(os.tmpdir(), `benchside-tailwind-public-${stamp}.config.cjs`);
  const files = await publicAreaFiles(projectDir);
  // tailwind.config.ts with the content narrowed to those files (Tailwind loads both through jiti).
  await writeFile(
    config,
    `const base = require(${JSON.stringify(path.join(projectDir, "tailwind.config.ts"))});\nmodule.exports = { ...(base.default ?? base), content: ${JSON.stringify(files)} };\n`,
  );
  try {
    await promisify(execFile)(
      process.execPath,
      [path.join(projectDir, "node_modules", "tailwindcss", "lib", "cli.js"), "-c", config, "-i", path.join(projectDir, "app", "globals.css"), "-o", out, "--minify"],
      { cwd: projectDir, maxBuffer: 16 * 1024 * 1024 },
    );
    const css = FONT_CSS + (await readFile(out, "utf8")).trim();
    const dist = path.resolve(projectDir, distDir);
    await mkdir(dist, { recursive: true });
    await writeFile(path.join(dist, PUBLIC_CSS_FILE), css);
    return css;
  } finally {
    await Promise.all([rm(out, { force: true }), rm(config, { force: true })]);
  }
}
