import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { StoryGrid } from "@/app/(public)/s/[shop]/_components/story-grid";
import { kindFromSearch, kindHref, storiesOfKind } from "@/app/(public)/s/[shop]/_components/story-filter";

// The shop page's machine-kind filter runs in the browser, since the page is cached for everyone
// (issue 17): what the address asks for, where a chip links, what shows; and the HTML every
// visitor gets (every story, chips as plain links, so it works without JavaScript too).
const KINDS = [
  { kind: "atv", label: "ATV / quad" },
  { kind: "dirt_bike", label: "Dirt bike" },
];
const ITEMS = [
  { key: "front-end", kind: "atv", card: createElement("p", null, "Front end rebuilt") },
  { key: "top-end", kind: "dirt_bike", card: createElement("p", null, "Top end refreshed") },
  { key: "winch", kind: "atv", card: createElement("p", null, "Winch rewired") },
];

describe("the machine-kind filter", () => {
  it("takes the kind from the address only when the page has a chip for it", () => {
    expect(kindFromSearch("?kind=atv", KINDS)).toBe("atv");
    expect(kindFromSearch("?other=1&kind=dirt_bike", KINDS)).toBe("dirt_bike");
    for (const search of ["", "?kind=", "?kind=snowmobile", "?kind=ATV", "?kind=atv%20"]) expect(kindFromSearch(search, KINDS), search).toBeNull();
  });

  it("links each chip to a shareable address of the same page", () => {
    expect(kindHref("copper-gulch", null)).toBe("/s/copper-gulch");
    expect(kindHref("copper-gulch", "dirt_bike")).toBe("/s/copper-gulch?kind=dirt_bike");
    expect(kindFromSearch(new URL(kindHref("copper-gulch", "atv"), "http://app.test").search, KINDS)).toBe("atv");
  });

  it("shows the stories of the kind, in the page's order; every story for none", () => {
    expect(storiesOfKind(ITEMS, "atv").map((i) => i.key)).toEqual(["front-end", "winch"]);
    expect(storiesOfKind(ITEMS, "dirt_bike").map((i) => i.key)).toEqual(["top-end"]);
    expect(storiesOfKind(ITEMS, null).map((i) => i.key)).toEqual(["front-end", "top-end", "winch"]);
  });

  it("the cached HTML holds every story and the chips as links, 'All machines' current", () => {
    const html = renderToStaticMarkup(createElement(StoryGrid, { shop: "copper-gulch", kinds: KINDS, items: ITEMS }));
    for (const text of ["Front end rebuilt", "Top end refreshed", "Winch rewired"]) expect(html).toContain(text);
    expect(html).toContain('href="/s/copper-gulch?kind=atv"');
    expect(html).toContain('href="/s/copper-gulch?kind=dirt_bike"');
    expect(html).toMatch(/<a href="\/s\/copper-gulch" aria-current="page"[^>]*>All machines<\/a>/);
    expect(html.match(/aria-current/g)).toHaveLength(1);
  });

  it("no chips for a single kind: nothing to filter", () => {
    const html = renderToStaticMarkup(createElement(StoryGrid, { shop: "copper-gulch", kinds: KINDS.slice(0, 1), items: ITEMS.filter((i) => i.kind === "atv") }));
    expect(html).not.toContain("Filter by kind of machine");
    expect(html).toContain("Winch rewired");
  });
});
