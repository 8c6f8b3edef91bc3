import { describe, expect, it } from "vitest";
import { type MediaFacts, type MediaViewer, mayViewMedia } from "@/lib/permissions";

// Who may see a photo or clip of a job: one pure rule, used wherever a photo or clip is served
// (signed-in media routes through lib/server/access.ts, mail thumbnails, public story routes).
// product rule (lib/permissions.ts), no published source

const FACTS = ["shared", "moneyEntry", "quotedInRequest", "inPublishedStory"] as const;

/** All 16 combinations of the four facts. */
const everyCombination: MediaFacts[] = Array.from({ length: 16 }, (_, bits) => ({
  shared: !!(bits & 1),
  moneyEntry: !!(bits & 2),
  quotedInRequest: !!(bits & 4),
  inPublishedStory: !!(bits & 8),
}));

const describeFacts = (f: MediaFacts) => FACTS.filter((k) => f[k]).join(", ") || "none";

/**
 * Checks one viewer on all 16 combinations: `decides` names the facts the rule looks at for this
 * viewer and `table` gives the answer for each of their values (written out, not computed); the
 * other facts must make no difference.
 */
function checkViewer(viewer: MediaViewer, decides: readonly (typeof FACTS)[number][], table: [boolean[], boolean][]) {
  expect(table).toHaveLength(2 ** decides.length);
  for (const facts of everyCombination) {
    const row = table.find(([values]) => decides.every((fact, i) => facts[fact] === values[i]));
    expect(row, `no row for ${describeFacts(facts)}`).toBeDefined();
    expect(mayViewMedia(viewer, facts), `${viewer} with ${describeFacts(facts)}`).toBe(row![1]);
  }
}

describe("mayViewMedia: who sees a job's photos and clips", () => {
  it("the shop sees every one of them, whatever is true of it", () => {
    for (const facts of everyCombination) expect(mayViewMedia("shop", facts), describeFacts(facts)).toBe(true);
  });

  it("nobody (no viewer at all) sees any of them", () => {
    for (const facts of everyCombination) expect(mayViewMedia(null, facts), describeFacts(facts)).toBe(false);
  });

  it("the machine's owner sees shared ones and those quoted in a request put to them, money or not", () => {
    // [shared, quotedInRequest] → may view; moneyEntry and inPublishedStory make no difference.
    checkViewer("owner", ["shared", "quotedInRequest"], [
      [[false, false], false],
      [[true, false], true],
      [[false, true], true],
      [[true, true], true],
    ]);
  });

  it("a follower sees shared ones that aren't about money, and nothing quoted only in a request", () => {
    // [shared, moneyEntry] → may view; quotedInRequest and inPublishedStory make no difference.
    checkViewer("follower", ["shared", "moneyEntry"], [
      [[false, false], false],
      [[true, false], true],
      [[true, true], false],
      [[false, true], false],
    ]);
  });

  it("the public sees only what a published story shows", () => {
    // [inPublishedStory] → may view; being shared, money or quoted makes no difference.
    checkViewer("public", ["inPublishedStory"], [
      [[false], false],
      [[true], true],
    ]);
  });

  it("worked cases from the product", () => {
    const none: MediaFacts = { shared: false, moneyEntry: false, quotedInRequest: false, inPublishedStory: false };
    // A shop-only photo attached as evidence to an approval request sent to the owner.
    const evidence = { ...none, quotedInRequest: true };
    expect([mayViewMedia("shop", evidence), mayViewMedia("owner", evidence), mayViewMedia("follower", evidence), mayViewMedia("public", evidence)]).toEqual([true, true, false, false]);
    // A shared photo on the entry recording the owner's priced decision.
    const decision = { ...none, shared: true, moneyEntry: true };
    expect([mayViewMedia("owner", decision), mayViewMedia("follower", decision), mayViewMedia("public", decision)]).toEqual([true, false, false]);
    // A shared bench photo that a published story shows.
    const story = { ...none, shared: true, inPublishedStory: true };
    expect([mayViewMedia("owner", story), mayViewMedia("follower", story), mayViewMedia("public", story)]).toEqual([true, true, true]);
    // The same photo once the story is taken down: the public loses it, the owner and followers keep it.
    const takenDown = { ...story, inPublishedStory: false };
    expect([mayViewMedia("owner", takenDown), mayViewMedia("follower", takenDown), mayViewMedia("public", takenDown)]).toEqual([true, true, false]);
  });
});
