import path from "node:path";
import { describe, expect, it } from "vitest";
import { clientBoundaries, clientModules, pathToPackage, routeFiles } from "../support/client-imports";

// The customer pages' browser bundles stay light (DESIGN §5: customer job page First Load JS ≤
// 180 kB gzip, no validation library in customer bundles; clips play in the browser's own
// <video>). Read from the source's import graph (tests/support/client-imports.ts), so a new
// import of a schema module from a client component fails here, before any build.

const root = path.resolve(__dirname, "../..");

/** Folders whose client components the owner's and the public pages render. */
const CUSTOMER_FOLDERS = ["components/journal", "components/approvals", "components/invoices", "components/dropoff", "components/portfolio", "app/(owner)"];

/** The owner's pages, and what every page has around it (root layout, error and not-found screens). */
const CUSTOMER_ENTRIES = [
  ...routeFiles(root, "app/(owner)", ["page.tsx", "layout.tsx", "loading.tsx", "error.tsx", "not-found.tsx"]),
  ...routeFiles(root, "app/(public)", ["page.tsx", "layout.tsx", "loading.tsx", "error.tsx", "not-found.tsx"]),
  ...["app/layout.tsx", "app/error.tsx", "app/global-error.tsx", "app/not-found.tsx", "app/forbidden.tsx"],
];

/** Packages no customer page may hand to the browser, with the reason. */
const BANNED: Record<string, string> = {
  zod: "validation runs on the server; client code imports the pure modules, not lib/schemas/*",
  "@mux/mux-player-react": "clips are MP4: the <video> of components/journal/clip-player.tsx plays them (no HLS engine, no analytics, no third-party script)",
  "@mux/mux-player": "as above",
  "@tiptap/react": "the owner's pages read notes through NoteView (components/rich-text/note-view.tsx), not the editor",
};

function reached(files: string[]): string[] {
  const found: string[] = [];
  for (const file of files) {
    for (const pkg of Object.keys(BANNED)) {
      const chain = pathToPackage(root, path.join(root, file), pkg);
      if (chain) found.push(`${chain.join(" > ")} (${BANNED[pkg]})`);
    }
  }
  return found;
}

describe("what the customer pages send to the browser", () => {
  it("the walk sees through our imports to a package (a schema module reaches zod)", () => {
    expect(pathToPackage(root, path.join(root, "lib/schemas/journal.ts"), "zod")).toEqual(["lib/schemas/journal.ts", "zod"]);
    // Through a chain: the error mapping of the route wrapper uses zod at run time.
    expect(pathToPackage(root, path.join(root, "lib/route.ts"), "zod")).not.toBeNull();
    // The timeline's shapes and pure helpers, which client components import, need none.
    expect(pathToPackage(root, path.join(root, "lib/journal.ts"), "zod")).toBeNull();
  });

  it("finds the client components of the customer folders and the pages' client boundaries", () => {
    const modules = clientModules(root, CUSTOMER_FOLDERS).map((f) => path.relative(root, f));
    expect(modules).toContain("components/journal/clip-player.tsx");
    expect(modules).toContain("components/journal/photo-grid.tsx");
    const boundaries = clientBoundaries(root, CUSTOMER_ENTRIES);
    expect(boundaries).toContain("app/(owner)/my/jobs/[job]/_components/owner-timeline.tsx");
    expect(boundaries).toContain("app/error.tsx");
  });

  it("no client component under the customer folders reaches zod, the streaming player or the editor", () => {
    const modules = clientModules(root, CUSTOMER_FOLDERS).map((f) => path.relative(root, f));
    expect(reached(modules)).toEqual([]);
  });

  it("no client component the owner's or the public pages render reaches them either", () => {
    expect(reached(clientBoundaries(root, CUSTOMER_ENTRIES))).toEqual([]);
  });

  it("the staff job page leaves the editor and the photo viewer to later fetches, and has no zod or streaming player", () => {
    // DESIGN §5: staff job page First Load JS ≤ 250 kB gzip, player and editor loaded lazily.
    const entries = [
      ...routeFiles(root, "app/(staff)/shop/[shop]/jobs/[number]", ["page.tsx", "layout.tsx", "loading.tsx"]).filter((f) => f.split("/").length <= 7),
      "app/(staff)/shop/[shop]/layout.tsx",
      "app/layout.tsx",
      "app/error.tsx",
      "app/global-error.tsx",
    ];
    const boundaries = clientBoundaries(root, entries);
    expect(boundaries).toContain("app/(staff)/shop/[shop]/jobs/[number]/_components/job-journal.tsx");
    const firstLoad = (pkg: string) => boundaries.map((f) => pathToPackage(root, path.join(root, f), pkg, { lazy: false })).filter(Boolean);
    for (const pkg of ["zod", "@tiptap/react", "@tiptap/core", "@tiptap/starter-kit", "yet-another-react-lightbox", "@mux/mux-player-react", "@mux/mux-player"]) {
      expect(firstLoad(pkg), pkg).toEqual([]);
    }
    // The editor is there, behind the import() of the note box's first focus.
    const lazily = boundaries.map((f) => pathToPackage(root, path.join(root, f), "@tiptap/react")).filter(Boolean);
    expect(lazily.length).toBeGreaterThan(0);
    // ...and that fetch brings no zod with it (the editor counts characters with NOTE_LIMITS from note-types.ts).
    expect(boundaries.map((f) => pathToPackage(root, path.join(root, f), "zod")).filter(Boolean)).toEqual([]);
  });
});
