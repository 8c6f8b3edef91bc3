import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { CAUTIONS_SEEN_CAP, cautionKey, hasSeen, parseSeen, withSeen } from "@/lib/caution-seen";
import { QUICK_HASH, QUICK_KINDS, composerTarget, quickKindFromHash } from "@/lib/quick-post";

// Issue 20 §3: the phone-first bench flow. Cautions fold after they were seen once on a page
// (remembered per page and caution), and the quick-post bar opens the forms the pages already have.

describe("cautions seen once per page", () => {
  it("keys a caution by page path and name, one job's bench page apart from another's", () => {
    expect(cautionKey("/shop/copper-gulch/jobs/12/bench", "bench")).toBe("/shop/copper-gulch/jobs/12/bench#bench");
    expect(cautionKey("/shop/copper-gulch/jobs/12/bench/", "bench")).toBe(cautionKey("/shop/copper-gulch/jobs/12/bench", "bench"));
    expect(cautionKey("/shop/copper-gulch/jobs/12/bench", "bench")).not.toBe(cautionKey("/shop/copper-gulch/jobs/13/bench", "bench"));
    expect(cautionKey("/shop/copper-gulch/jobs/12/bench", "torque")).not.toBe(cautionKey("/shop/copper-gulch/jobs/12/bench", "bench"));
  });

  it("shows in full the first time: nothing stored, or storage holding junk, means not seen", () => {
    const key = cautionKey("/shop/a/jobs/1/bench", "bench");
    for (const raw of [null, "", "not json", "[1,2]", "42", "null", '{"x":"yesterday"}', `{"${key}":-5}`, `{"${key}":"1"}`]) {
      expect(hasSeen(parseSeen(raw), key), String(raw)).toBe(false);
    }
  });

  it("remembers a caution once seen, on that page only, and survives a round trip through storage", () => {
    const bench12 = cautionKey("/shop/a/jobs/12/bench", "bench");
    const bench13 = cautionKey("/shop/a/jobs/13/bench", "bench");
    const stored = JSON.stringify(withSeen({}, bench12, 1_000));
    const seen = parseSeen(stored);
    expect(hasSeen(seen, bench12)).toBe(true);
    expect(hasSeen(seen, bench13)).toBe(false);
    // Seeing it again moves its time on; nothing else changes.
    expect(withSeen(seen, bench12, 2_000)).toEqual({ [bench12]: 2_000 });
  });

  it("keeps the most recently seen pages only, so storage doesn't grow with every job", () => {
    let seen = {};
    for (let i = 0; i < CAUTIONS_SEEN_CAP + 25; i++) seen = withSeen(seen, cautionKey(`/shop/a/jobs/${i}/bench`, "bench"), i);
    expect(Object.keys(seen)).toHaveLength(CAUTIONS_SEEN_CAP);
    expect(hasSeen(seen, cautionKey("/shop/a/jobs/0/bench", "bench"))).toBe(false); // oldest out: shown in full again
    expect(hasSeen(seen, cautionKey(`/shop/a/jobs/${CAUTIONS_SEEN_CAP + 24}/bench`, "bench"))).toBe(true);
    expect(Object.keys(withSeen({ a: 1, b: 2, c: 3 }, "d", 4, 2)).sort()).toEqual(["c", "d"]);
  });
});

describe("the quick-post bar's targets", () => {
  const ROOT = path.resolve(__dirname, "../..");
  const read = (file: string) => readFileSync(path.join(ROOT, file), "utf8");

  it("opens note, photo and clip in the job page's composer, torque and reading on the bench page", () => {
    expect(QUICK_KINDS.map((k) => [k, composerTarget(k).page])).toEqual([
      ["note", "job"],
      ["photo", "job"],
      ["clip", "job"],
      ["torque", "bench"],
      ["reading", "bench"],
    ]);
  });

  it("reads back every hash it sends, and nothing else", () => {
    for (const kind of QUICK_KINDS) expect(quickKindFromHash(QUICK_HASH[kind])).toBe(kind);
    for (const other of ["", "#", "#parts", "#compose-", "#TORQUE", "torque"]) expect(quickKindFromHash(other)).toBeNull();
    expect(new Set(Object.values(QUICK_HASH)).size).toBe(QUICK_KINDS.length);
  });

  it("addresses ids the pages really give their composer tabs and bench sections", () => {
    // The composer names its tabs `tab-<value>` and its panel `panel-<value>` for these values.
    const journal = read("app/(staff)/shop/[shop]/jobs/[number]/_components/job-journal.tsx");
    expect(journal).toContain("id={`tab-${value}`}");
    expect(journal).toContain("id={`panel-${tab}`}");
    expect(journal).toContain('headingId="composer-heading"');
    for (const kind of ["note", "photo", "clip"] as const) {
      const target = composerTarget(kind);
      if (target.page !== "job") throw new Error(kind);
      const value = target.tabId.replace(/^tab-/, "");
      expect(target.panelId).toBe(`panel-${value}`);
      expect(journal).toMatch(new RegExp(`\\["${value}", "`));
    }
    const bench = "app/(staff)/shop/[shop]/jobs/[number]/bench/_components/";
    for (const [kind, file] of [["torque", "torque-section.tsx"], ["reading", "readings-section.tsx"]] as const) {
      const target = composerTarget(kind);
      if (target.page !== "bench") throw new Error(kind);
      expect(read(bench + file)).toContain(`headingId="${target.headingId}"`);
      expect(QUICK_HASH[kind]).toBe(`#${target.headingId}`);
    }
  });
});
