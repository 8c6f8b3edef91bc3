import "server-only";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { pathToFileURL } from "node:url";

// The public pages' inline stylesheet (scripts/lib/public-css.mjs), as the build wrote it into its
// folder. Read once per server process: the pages that carry it are rendered rarely (ISR).

const FILE = "public-pages.css"; // PUBLIC_CSS_FILE in scripts/lib/public-css.mjs

let loaded: Promise<string> | null = null;

async function load(): Promise<string> {
  const distDir = path.resolve(process.cwd(), process.env.NEXT_DIST_DIR || ".next");
  try {
    return await readFile(path.join(distDir, FILE), "utf8");
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== "ENOENT") throw error;
    // `next dev` runs no production compile step, so the file is made on first use there.
    if (process.env.NODE_ENV === "development") {
      const { buildPublicCss } = (await import(/* webpackIgnore: true */ /* turbopackIgnore: true */ pathToFileURL(path.join(process.cwd(), "scripts", "lib", "public-css.mjs")).href)) as {
        buildPublicCss(o: { projectDir: string; distDir: string }): Promise<string>;
      };
      return buildPublicCss({ projectDir: process.cwd(), distDir });
    }
    throw new Error(`${path.join(distDir, FILE)} is missing: it is made by \`next build\` (next.config.mjs, runAfterProductionCompile); build again.`);
  }
}

/** The CSS the public pages put in their <head>. */
export function publicPagesCss(): Promise<string> {
  loaded ??= load().catch((error: unknown) => {
    loaded = null; // a later render tries again
    throw error;
  });
  return loaded;
}
