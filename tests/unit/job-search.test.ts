import { describe, expect, it } from "vitest";
import { searchPlan } from "@/db/queries/job-search";

// How the board's search box is split for its indexes (db/queries/job-search.ts).
describe("board search plan", () => {
  it("reads job numbers the way people write them", () => {
    expect(searchPlan("J-0042").number).toBe(42);
    expect(searchPlan("j42").number).toBe(42);
    expect(searchPlan("42").number).toBe(42);
    expect(searchPlan("Acker").number).toBeNull();
  });

  it("turns words of three letters or more into required word prefixes, and nothing else reaches MATCH", () => {
    expect(searchPlan("Zed Acker").words).toBe("+Zed* +Acker*");
    // Boolean-mode operators in the text are separators, never operators.
    expect(searchPlan('-acker +"zed" (x*) ~y <z>').words).toBe("+acker* +zed*");
    expect(searchPlan("GVH8-17-99001").words).toBe("+GVH8* +99001*");
  });

  it("keeps short words as plain text filters beside the indexed words, and alone uses prefixes only", () => {
    expect(searchPlan("Brin Fallowby 40").short).toEqual(["%40%"]);
    expect(searchPlan("Ko")).toMatchObject({ words: null, short: [], prefix: "Ko%" });
  });

  it("treats LIKE wildcards as text", () => {
    expect(searchPlan("50%_off").prefix).toBe("50\\%\\_off%");
  });
});
